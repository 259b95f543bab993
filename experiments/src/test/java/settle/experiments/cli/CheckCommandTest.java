package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.TreeMap;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.datasets.DataSources;
import settle.datasets.Dataset;
import settle.engine.minimum.Curvature;
import settle.engine.minimum.Minimiser;
import settle.engine.model.Model;
import settle.engine.schedule.RunShape;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.PlanData;
import settle.experiments.plan.PlanParser;
import settle.experiments.plan.PlanWriter;

class CheckCommandTest {

    /** Printed rates have 5 significant digits. */
    static final double PRINTED = 5e-5;

    static final String PLAN = """
            study: check-me
            seed: 11
            data:
              source: "synthetic:gaussian?rows=100&features=3&seed=4"
            model: {l2: 0.1}
            training: {epochs: 3, batch: 16, snapshots: 4}
            baseline: constant
            arms:
              - name: constant
                schedule: {kind: constant, rate: 0.1}
              - name: reciprocal
                schedule: {kind: reciprocal, rate: 0.2, decay: 1.0, per: epoch}
              - name: huge
                schedule: {kind: constant, rate: 1000}
                manual: true
            """;

    static String[] run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.run(new PrintWriter(out), new PrintWriter(err), args);
        return new String[] {Integer.toString(code), out.toString(), err.toString()};
    }

    /** @return the rates printed in the rows labelled {@code label}, one list per row */
    static List<double[]> rows(String stdout, String label) {
        List<double[]> rows = new ArrayList<>();
        for (String line : stdout.split("\n")) {
            if (line.contains(label) && line.trim().matches("\\d+ +\\d+ +[0-9.]+ +" + label + ".*")) {
                String[] f = line.trim().split(" +");
                int skip = 3 + label.split(" ").length;
                double[] v = new double[f.length - skip];
                for (int i = 0; i < v.length; i++) {
                    v[i] = Double.parseDouble(f[skip + i]);
                }
                rows.add(v);
            }
        }
        return rows;
    }

    @Test
    void checkPrintsTheResolvedPlanRatesSumsAndStability(@TempDir Path dir) throws IOException {
        Path plan = dir.resolve("check-me.yaml");
        Files.writeString(plan, PLAN);
        String[] r = run("check", plan.toString());
        assertEquals("0", r[0], r[2]);
        String out = r[1];
        ParsedPlan parsed = PlanParser.read(plan);
        assertTrue(out.startsWith("plan " + plan + ": valid (sha256 " + PlanWriter.sha256(parsed.plan()) + ")"));
        for (String line : PlanWriter.toYaml(parsed.plan()).split("\n")) {
            assertTrue(out.contains("\n  " + line + "\n"), "resolved plan line " + line);
        }

        // N_train = Σ over classes of n_c − round(0.2·n_c) (the stratified test split), U = ⌈N_train / 16⌉
        Dataset all = DataSources.load("synthetic:gaussian?rows=100&features=3&seed=4", null, null);
        int train = 0;
        for (int n : all.classCounts()) {
            train += n - Math.round(0.2 * n);
        }
        int u = (train + 15) / 16;
        assertTrue(out.contains(String.format(Locale.ROOT, "updates: ⌈%d / 16⌉ = %d per epoch, 3 epochs, %d updates",
                train, u, 3 * u)), out);
        assertTrue(out.contains("epoch 1 is the first pass over the training split"), "counter convention");

        // epoch starts: reciprocal 0.2/(1 + n): 0.2/2 = 0.1, 0.2/3 = 0.066667, 0.2/4 = 0.05 (DESIGN.md's example)
        List<double[]> starts = rows(out, "epoch start");
        assertEquals(3, starts.size());
        double[] reciprocal = {0.1, 0.2 / 3, 0.05};
        for (int e = 0; e < 3; e++) {
            assertEquals(0.1, starts.get(e)[0], PRINTED);
            assertEquals(reciprocal[e], starts.get(e)[1], PRINTED);
            assertEquals(1000, starts.get(e)[2], PRINTED);
        }
        assertEquals(2, rows(out, "first updates").size(), "updates 2 and 3 (update 1 is an epoch start)");
        List<double[]> last = rows(out, "last update");
        assertEquals(1, last.size());
        assertEquals(0.05, last.get(0)[1], PRINTED);

        // Σα = U·(0.1 + 0.066667 + 0.05) = U·0.216667; Σα² = U·(0.01 + 0.0044444 + 0.0025) = U·0.0169444
        Matcher m = Pattern.compile("\n  #2 +([0-9.]+) +([0-9.]+)  Robbins–Monro").matcher(out);
        assertTrue(m.find(), out);
        assertEquals(u * (0.1 + 0.2 / 3 + 0.05), Double.parseDouble(m.group(1)), 1e-4 * u);
        assertEquals(u * (0.01 + 0.04 / 9 + 0.0025), Double.parseDouble(m.group(2)), 1e-5 * u);

        // the stability bound 2/λmax(H) at θ* of the training split the plan uses
        PlanData data = PlanData.load(parsed);
        Model model = parsed.plan().model().build(3, data.train().classes());
        double lambdaMax = Curvature.at(model, data.train(), new Minimiser().minimise(model, data.train()).theta())
                .lambdaMax();
        Matcher b = Pattern.compile("stability bound of the mean: α < 2/λmax\\(H\\) = ([0-9.]+)").matcher(out);
        assertTrue(b.find(), out);
        assertEquals(2 / lambdaMax, Double.parseDouble(b.group(1)), 1e-4 * (2 / lambdaMax));
        assertTrue(out.contains("\n  #3 ") && out.contains("ABOVE the stability bound"), out);
        assertTrue(r[2].contains("warning: " + plan + ":14:5: arms[2].schedule: arm 'huge': its largest rate 1000.0"
                + " is above the stability bound"), r[2]);
        assertTrue(r[2].contains("arms[2].manual: arm 'huge' is manual"), r[2]);
    }

    @Test
    void checkShowsTheResolvedTable(@TempDir Path dir) throws IOException {
        Files.writeString(dir.resolve("t.csv"), """
                id,colour,size,y
                1,red,1.5,p
                2,blue,,q
                3,red,2.5,p
                4,,3.5,q
                5,green,4.5,p
                6,blue,5.5,q
                7,red,6.5,p
                8,blue,7.5,q
                9,green,8.5,p
                10,red,9.5,q
                """);
        Path plan = dir.resolve("t.yaml");
        Files.writeString(plan, """
                data: {source: csv:t.csv, drop: [id], missing: impute}
                training: {epochs: 2, batch: 4}
                arms: [{schedule: {kind: constant, rate: 0.1}}]
                """);
        String[] r = run("check", plan.toString());
        assertEquals("0", r[0], r[2]);
        String out = r[1];
        // stratified test split: round(0.2 · 5) = 1 row of each class
        for (String line : List.of(
                "table: 10 rows, 4 columns; data.missing: impute",
                "  column  type    missing  encoding",
                "  id      number        0  dropped (data.drop)",
                "  y       text          0  label",
                "  classes: p 5 (training 4, test 1); q 5 (training 4, test 1)")) {
            assertTrue(out.contains("\n" + line + "\n"), line + " in\n" + out);
        }
        assertTrue(Pattern.compile("\n  colour  text          1  3 levels( \\+ a level for gaps → 4 inputs| → 3 inputs)\n")
                .matcher(out).find(), out);
        assertTrue(Pattern.compile("\n  size    number        1  (2 inputs: the value \\(training median [0-9.]+ where"
                + " missing\\) and 'size \\(was missing\\)' \\(0/1\\)|1 input \\(training median [0-9.]+ where missing\\))\n")
                .matcher(out).find(), out);
        assertTrue(Pattern.compile("\n  inputs after encoding: [4-6]\n  classes:").matcher(out).find(), out);
        assertTrue(out.contains("\n  training split: 8 rows"), out);
        assertTrue(out.contains("\n  test split: 2 rows"), out);
    }

    @Test
    void epochStartsAreSampledForLongRuns() {
        // 1000 epochs: the first 10 starts, then every ⌈1000/50⌉ = 20th (epochs 21, 41, …, 981), and the last
        TreeMap<Long, String> p = CheckCommand.points(new RunShape(1000, 7));
        long starts = p.values().stream().filter("epoch start"::equals).count();
        assertEquals(10 + 49 + 1, starts);
        assertEquals("last update", p.get(7000L));
        assertEquals("epoch start", p.get(20L * 7 + 1), "epoch 21 starts at update 141");
    }

    @Test
    void aBadPlanExitsWith2AndOneLineOnStderr(@TempDir Path dir) throws IOException {
        Path plan = dir.resolve("p.yaml");
        Files.writeString(plan, PLAN.replace("epochs: 3", "epoch: 3"));
        String[] r = run("check", plan.toString());
        assertEquals("2", r[0]);
        assertEquals(plan + ":6:12: training.epoch: unknown key 'epoch' in training; did you mean 'epochs'? "
                + "(accepted: epochs, batch, sampling, momentum, tail, snapshots)" + System.lineSeparator(), r[2]);
    }

    @Test
    void aMissingPlanFileExitsWith2() {
        String[] r = run("check", "/no/such/plan.yaml");
        assertEquals("2", r[0]);
        assertEquals("/no/such/plan.yaml: no such file; give the path of a plan YAML file" + System.lineSeparator(), r[2]);
    }

    @Test
    void separableDataWithoutPenaltyHasNoMinimiserAndExitsWith1(@TempDir Path dir) throws IOException {
        Path plan = dir.resolve("p.yaml");
        // two well separated Gaussian classes, λ = 0: no finite minimiser
        Files.writeString(plan, PLAN.replace("model: {l2: 0.1}", "model: {l2: 0}")
                .replace("rows=100&features=3&seed=4", "rows=100&features=3&separation=30&seed=4"));
        String[] r = run("check", plan.toString());
        assertEquals("1", r[0], r[1] + r[2]);
        assertTrue(r[2].contains(plan + ":5:13: model.l2: no minimiser exists"), r[2]);
    }

    /** @return a plan with {@code arms} constant arms (rates 0.01, 0.02, …) and {@code replicates} replicates */
    static String arms(int arms, int replicates) {
        StringBuilder b = new StringBuilder("study: reach\nseed: 11\nreplicates: " + replicates + "\ndata:\n"
                + "  source: \"synthetic:gaussian?rows=100&features=3&seed=4\"\nmodel: {l2: 0.1}\n"
                + "training: {epochs: 3, batch: 16, snapshots: 4}\nbaseline: a1\narms:\n");
        for (int i = 1; i <= arms; i++) {
            b.append("  - name: a").append(i).append("\n    schedule: {kind: constant, rate: 0.0").append(i).append("}\n");
        }
        return b.toString();
    }

    @Test
    void tooFewReplicatesForAVerdictAreAWarning(@TempDir Path dir) throws IOException {
        // 7 arms: m = 6 compared with the baseline. The smallest Bonferroni-adjusted exact signed-rank p with n pairs is
        // m·2/2ⁿ: n = 6 gives 12/64 = 0.1875 (shown rounded up: 0.19); n = 7 gives 12/128 = 0.094; n = 8 gives
        // 12/256 = 0.047 ≤ 0.05, so 8 are needed.
        Path plan = dir.resolve("reach.yaml");
        Files.writeString(plan, arms(7, 6));
        String[] r = run("check", plan.toString());
        assertEquals("0", r[0], r[2]);
        assertTrue(r[2].contains("warning: " + plan + ":3:13: replicates: 6 replicates with 6 arms against the baseline"
                + " can reach an adjusted p of at least 0.19, never below 0.05; 8 are needed" + System.lineSeparator()),
                r[2]);
        assertFalse(r[1].contains("no verdict"), r[1]);

        Files.writeString(plan, arms(7, 7));
        r = run("check", plan.toString());
        assertTrue(r[2].contains(":3:13: replicates: 7 replicates with 6 arms against the baseline can reach an"
                + " adjusted p of at least 0.094, never below 0.05; 8 are needed"), r[2]);

        Files.writeString(plan, arms(7, 8));
        r = run("check", plan.toString());
        assertEquals("0", r[0], r[2]);
        assertFalse(r[2].contains("replicates:"), r[2]);
    }

    @Test
    void oneArmAgainstTheBaselineNeedsFiveReplicates(@TempDir Path dir) throws IOException {
        // m = 1, no adjustment: n = 5 gives 2/2⁵ = 0.0625 (shown rounded up: 0.063); n = 6 gives 2/2⁶ = 0.031
        Path plan = dir.resolve("reach.yaml");
        Files.writeString(plan, arms(2, 5));
        String[] r = run("check", plan.toString());
        assertTrue(r[2].contains(":3:13: replicates: 5 replicates with 1 arm against the baseline can reach a p of"
                + " at least 0.063, never below 0.05; 6 are needed"), r[2]);
        Files.writeString(plan, arms(2, 6));
        assertFalse(run("check", plan.toString())[2].contains("replicates:"));
    }

    @Test
    void aPlanWithOneArmHasNoVerdictAndSaysSo(@TempDir Path dir) throws IOException {
        Path plan = dir.resolve("reach.yaml");
        Files.writeString(plan, arms(1, 2));
        String[] r = run("check", plan.toString());
        assertEquals("0", r[0], r[2]);
        assertTrue(r[1].contains("\n  no verdict: the plan has one arm, so there is no other arm to compare with the"
                + " baseline\n"), r[1]);
        assertFalse(r[2].contains("replicates:"), "no comparison, so no warning about reaching one: " + r[2]);
    }
}
