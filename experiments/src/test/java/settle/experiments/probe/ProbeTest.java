package settle.experiments.probe;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.engine.model.Model;
import settle.engine.schedule.Schedules;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.Trainer;
import settle.engine.train.TrainingSettings;
import settle.experiments.cli.Main;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.PlanData;
import settle.experiments.plan.PlanParser;

/**
 * The probe's suggested upper end against an independent measure: r, the largest rate of a grid
 * (10^(k/4)) whose 5-epoch run at that constant rate still lowers the training objective below its start
 * for every probed seed. The issue asks for the upper end in [r/4, r].
 */
class ProbeTest {

    private static final int SEEDS = 5;
    private static final int CHECK_EPOCHS = 5;

    @TempDir
    Path dir;

    static String plan(String source, String model) {
        return "study: probed\nseed: 2026\nreplicates: 5\ndata:\n  source: " + source + "\nmodel:\n" + model
                + "training:\n  epochs: 20\n  batch: 32\narms:\n  - name: \"<b>small & slow\"\n"
                + "    schedule: {kind: constant, rate: 0.01}\n  - name: big\n    schedule: {kind: constant, rate: 5.0}\n";
    }

    /** @return r: the largest grid rate whose 5-epoch constant-rate run lowers F below F(θ₀) for every seed */
    static double largestFallingRate(ParsedPlan parsed) {
        PlanData data = PlanData.load(parsed);
        Model model = parsed.plan().model().build(data.train().features(), data.train().classes());
        TrainingSettings five = new TrainingSettings(CHECK_EPOCHS, parsed.plan().training().batch(),
                parsed.plan().training().sampling(), 0.0, 0.1, 2, false);
        double r = Double.NaN;
        for (int k = -12; k <= 12; k++) {
            double rate = Math.pow(10, k / 4.0);
            Trainer trainer = Trainer.builder(model, data.train(), Schedules.parse(Map.of("kind", "constant", "rate", rate)),
                    five).initialisation(parsed.plan().model().init()).build();
            boolean falls = true;
            for (int s = 1; s <= SEEDS && falls; s++) {
                ReplicateResult run = trainer.run(ReplicateSeeds.derive(parsed.plan().seed(), s));
                falls = !run.diverged() && run.epochs().get(CHECK_EPOCHS - 1).objective() < run.initialObjective();
            }
            if (falls) {
                r = rate;
            }
        }
        return r;
    }

    private void checkUpperEnd(String source, String model, boolean convex) throws Exception {
        Path planFile = dir.resolve("probed.yaml");
        Files.writeString(planFile, plan(source, model));
        ParsedPlan parsed = PlanParser.read(planFile);
        Probe.Result result = Probe.run(parsed, SEEDS, 1e-5, 100, 300);
        double r = largestFallingRate(parsed);
        assertTrue(result.upper() >= r / 4 && result.upper() <= r, source + ": upper end " + result.upper()
                + " outside [r/4, r] with r = " + r);
        assertEquals(result.upper() / 10, result.lower(), 0.0);
        assertEquals(convex, Double.isFinite(result.stabilityBound()), "2/λmax(H) only for convex models");

        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        Path page = dir.resolve("page.html");
        assertEquals(0, Main.run(new PrintWriter(out), new PrintWriter(err), "probe", planFile.toString(), "--html",
                page.toString()), err.toString());
        String text = out.toString();
        assertTrue(text.contains("Smith, \"Cyclical Learning Rates for Training Neural Networks\", WACV 2017"), text);
        assertTrue(text.contains("suggested initial-rate range: " + String.format(java.util.Locale.ROOT, "%.4g",
                result.lower()) + " to " + String.format(java.util.Locale.ROOT, "%.4g", result.upper())), text);
        assertEquals(convex, text.contains("2/λmax(H): "), text);
        assertTrue(text.contains("arm #2 'big': largest planned rate 5.000"), text);
        String html = Files.readString(page);
        assertTrue(html.contains("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none';"), html);
        assertTrue(html.contains("&lt;b&gt;small &amp; slow"), "arm names are escaped");
        assertFalse(html.contains("<b>small"), "no raw arm name in the page");
        assertFalse(html.contains("<script"), "no script");
        assertEquals(SEEDS, html.split("<polyline", -1).length - 1, "one curve per seed");
    }

    @Test
    void logisticRegressionOnWdbc() throws Exception {
        checkUpperEnd("bundled:wdbc", "  kind: logistic\n", true);
    }

    @Test
    void anMlpOnIris() throws Exception {
        checkUpperEnd("bundled:iris", "  kind: mlp\n  hidden: [16]\n", false);
    }
}
