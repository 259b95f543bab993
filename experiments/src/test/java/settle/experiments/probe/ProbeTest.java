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
import settle.engine.probe.RangeTest;
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
 * The probe's rule on bundled data: WDBC (UCI "Breast Cancer Wisconsin (Diagnostic)", Street, Wolberg &amp;
 * Mangasarian 1993) and the three-class wine table (UCI "Wine", Forina et al.), both with logistic regression
 * (softmax for wine). The suggested range lies strictly below the stability bound 2/λmax(H), every sweep stays below
 * it, and a 5-epoch constant-rate run at the upper end lowers the training objective below F(θ₀) for every probed
 * seed. Measured (seed 2026, batch 32, 5 sweeps of 300 updates from 1e-5 to 100): wdbc 0.01895 to 4.886 under the
 * bound 20.92; wine 0.02917 to 8.841 under 27.84.
 */
class ProbeTest {

    private static final int SEEDS = 5;

    @TempDir
    Path dir;

    /** What {@code settle probe} printed in the last {@link #check}. */
    private String printed;

    static String plan(String source, String training) {
        return "study: probed\nseed: 2026\nreplicates: 5\ndata:\n  source: " + source + "\nmodel:\n  kind: logistic\n"
                + "training:\n" + training + "arms:\n  - name: \"<b>small & slow\"\n"
                + "    schedule: {kind: constant, rate: 0.01}\n  - name: big\n    schedule: {kind: constant, rate: 5.0}\n";
    }

    /** @return the largest F after 5 constant-rate epochs at {@code rate} over the probed seeds, relative to F(θ₀) */
    static double worstRatio(ParsedPlan parsed, double rate) {
        PlanData data = PlanData.load(parsed);
        Model model = parsed.plan().model().build(data.train().features(), data.train().classes());
        int epochs = 5;
        TrainingSettings settings = new TrainingSettings(epochs, parsed.plan().training().batch(),
                parsed.plan().training().sampling(), parsed.plan().training().momentum(), 0.1, 2, false);
        Trainer trainer = Trainer.builder(model, data.train(), Schedules.parse(Map.of("kind", "constant", "rate", rate)),
                settings).initialisation(parsed.plan().model().init()).build();
        double worst = 0;
        for (int s = 1; s <= SEEDS; s++) {
            ReplicateResult run = trainer.run(ReplicateSeeds.derive(parsed.plan().seed(), s));
            double ratio = run.diverged() ? Double.POSITIVE_INFINITY
                    : run.epochs().get(epochs - 1).objective() / run.initialObjective();
            worst = Math.max(worst, ratio);
        }
        return worst;
    }

    private Probe.Result check(String source, String training) throws Exception {
        Path planFile = dir.resolve("probed.yaml");
        Files.writeString(planFile, plan(source, training));
        ParsedPlan parsed = PlanParser.read(planFile);
        Probe.Result r = Probe.run(parsed, SEEDS, 1e-5, 100, 300);
        double bound = r.stabilityBound();
        assertTrue(Double.isFinite(bound), "a convex model has a bound");
        assertEquals(SEEDS, r.withRange());
        assertTrue(r.lower() > 0 && r.lower() <= r.upper(), r.lower() + " to " + r.upper());
        assertTrue(r.upper() < bound, "upper end " + r.upper() + " below the bound " + bound);
        for (RangeTest.Sweep s : r.sweeps()) {
            for (double rate : s.rates()) {
                assertTrue(rate < bound, "no sweep tries a rate at or above the bound");
            }
        }
        double ratio = worstRatio(parsed, r.upper());
        assertTrue(ratio < 0.5, source + ": 5 epochs at the upper end " + r.upper() + " end at " + ratio
                + " × F(θ₀) for the worst seed");

        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        Path page = dir.resolve("page.html");
        assertEquals(0, Main.run(new PrintWriter(out), new PrintWriter(err), "probe", planFile.toString(), "--html",
                page.toString()), err.toString());
        String text = out.toString();
        printed = text;
        assertTrue(text.contains("page: " + page.toAbsolutePath().normalize()), text);
        assertTrue(text.contains("suggested initial-rate range: " + ProbePage.num(r.lower()) + " to "
                + ProbePage.num(r.upper())), text);
        assertTrue(text.contains("Lower end " + ProbePage.num(r.lower()) + ": the median"), text);
        String html = Files.readString(page);
        assertTrue(html.contains("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src &#39;none&#39;;"), html);
        assertTrue(html.contains("&lt;b&gt;small &amp; slow"), "arm names are escaped");
        assertFalse(html.contains("<b>small"), "no raw arm name in the page");
        assertFalse(html.contains("<script"), "no script");
        assertFalse(html.contains("#1f77b4"), "the report's palette, not another");
        assertTrue(html.contains("#0072B2"), "the report's palette");
        assertTrue(html.contains("class=\"span\""), "the suggested range is shaded");
        return r;
    }

    @Test
    void wdbc() throws Exception {
        Probe.Result r = check("bundled:wdbc", "  epochs: 20\n  batch: 32\n");
        // the plan's arms at 0.01 and 5 lie either side of the range (0.01895 to 4.886 when measured)
        assertTrue(0.01 < r.lower() && r.upper() < 5, r.lower() + " to " + r.upper());
        assertTrue(printed.contains("arm #1 '<b>small & slow': largest planned rate 0.01, below the suggested range"
                + " (its lower end is " + ProbePage.times(r.lower() / 0.01) + " × this)"), printed);
        assertTrue(printed.contains("arm #2 'big': largest planned rate 5, above the suggested range ("
                + ProbePage.times(5 / r.upper()) + " × its upper end)"), printed);
        assertTrue(printed.contains("with settle trace --plan " + dir.resolve("probed.yaml") + " --arm big --replicate 1\n"),
                printed);
    }

    @Test
    void numbersAreShortWithoutTrailingZeros() {
        assertEquals("1e-5", ProbePage.num(1e-5));
        assertEquals("1.33e-4", ProbePage.num(1.330e-4));
        assertEquals("-2.5e6", ProbePage.num(-2.5e6));
        assertEquals("100", ProbePage.num(100));
        assertEquals("0.4559", ProbePage.num(0.45594));
        assertEquals("0.01371", ProbePage.num(0.013712));
        assertEquals("0.001", ProbePage.num(0.001));
        assertEquals("0", ProbePage.num(0));
        assertEquals("—", ProbePage.num(Double.NaN));
        assertEquals("1.3", ProbePage.times(1.316));
        assertEquals("15", ProbePage.times(15.2));
        assertEquals("250", ProbePage.times(248));
    }

    @Test
    void wine() throws Exception {
        check("bundled:wine", "  epochs: 20\n  batch: 32\n");
    }
}
