package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import settle.experiments.cli.Main;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.metrics.VerdictSummary;
import settle.reports.stats.Comparison;
import settle.reports.stats.VerdictSentence;
import settle.reports.stats.VerdictSentence.Outcome;
import settle.reports.format.Metric;
import settle.reports.format.StudyReader;

/**
 * The verdict on real data: the example plans of the bundled datasets (UCI Breast Cancer Wisconsin (Diagnostic) and
 * Wine, the copies in Debian's python3-sklearn 1.2.1; Statlog (Landsat Satellite) and Congressional Voting Records,
 * the copies in R's mlbench 2.1-3; satellite's logistic plan at 10 epochs to keep the suite short), the MLP plan on
 * the satellite table, and a plan where a decay freezes early on WDBC. The pick never ends detectably farther from
 * the minimum than the baseline, a frozen arm is named as such and never picked, and no sentence says "no difference
 * detected" beside an interval that excludes no change. On the MLP plan decay visibly matters: a decaying arm is
 * picked, and it ends with a detectably higher test accuracy and lower test loss than the constant rate.
 */
class VerdictOnBundledDataTest {

    @TempDir
    Path dir;

    @ParameterizedTest(name = "{0}")
    @CsvSource({"plans/wdbc.yaml, 0", "plans/wine.yaml, 0", "plans/satellite.yaml, 10", "plans/housevotes84.yaml, 0",
        "plans/mlp.yaml, 0", "src/test/resources/plans/freeze.yaml, 0"})
    void thePickNeverEndsFartherAndSentencesAreCoherent(String planPath, int epochs) throws Exception {
        String text = Files.readString(Path.of(planPath));
        if (epochs > 0) {
            text = text.replaceFirst("(?m)^  epochs: \\d+$", "  epochs: " + epochs);
        }
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, text);
        Path study = dir.resolve("study");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.run(new PrintWriter(out), new PrintWriter(err), "run", plan.toString(), "--out", study.toString(),
                "--quiet");
        assertEquals(0, code, err.toString());
        boolean mlp = planPath.endsWith("mlp.yaml"); // not convex: no minimiser, judged by the final objective
        assertTrue(out.toString().startsWith(mlp ? "verdict (final objective" : "verdict (final gap"), out.toString());

        StudyAnalysis analysis = StudyAnalysis.of(StudyReader.read(study));
        VerdictSummary verdict = analysis.verdict();
        if (verdict.pick().picked()) {
            VerdictSummary.ArmVerdict pick = verdict.arms().get(verdict.pick().arm());
            assertEquals(Outcome.LOWER, pick.outcome(), pick.headline());
            assertFalse(pick.froze());
        }
        for (Metric m : analysis.compared()) {
            for (Comparison c : analysis.comparisons(m)) {
                String sentence = VerdictSentence.render(c);
                if (sentence.contains("no difference detected") && c.exact().level() + 1e-9 >= c.level()) {
                    assertFalse(c.intervalExcludesZero(), m + ", " + c.arm() + ": " + sentence);
                }
            }
        }
        if (mlp) {
            assertTrue(verdict.pick().picked(), out.toString());
            assertNotEquals("constant", verdict.arms().get(verdict.pick().arm()).name());
            for (Comparison c : analysis.comparisons(Metric.TEST_ACCURACY)) {
                assertTrue(c.detected() && c.armLarger(), c.arm() + ": " + VerdictSentence.render(c));
            }
            for (Comparison c : analysis.comparisons(Metric.TEST_LOSS)) {
                assertTrue(c.detected() && !c.armLarger(), c.arm() + ": " + VerdictSentence.render(c));
            }
        }
        if (planPath.endsWith("freeze.yaml")) {
            for (String frozen : new String[] {"fast-reciprocal", "fast-exponential"}) {
                VerdictSummary.ArmVerdict v = verdict.arms().stream().filter(a -> a.name().equals(frozen)).findFirst()
                        .orElseThrow();
                assertTrue(v.froze(), v.headline());
                assertEquals(Outcome.HIGHER, v.outcome());
                assertNotEquals(v.arm(), verdict.pick().arm());
            }
            assertTrue(out.toString().contains("it froze before reaching the minimum"), out.toString());
        }
    }
}
