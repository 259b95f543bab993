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
 * The verdict on real data: the example plans of the bundled datasets (UCI Breast Cancer Wisconsin (Diagnostic), Iris,
 * Wine and Optical Recognition of Handwritten Digits, the copies in Debian's python3-sklearn 1.2.1; optdigits at 10
 * epochs to keep the suite short) and a plan where a decay freezes early on WDBC. The pick never ends detectably
 * farther from the minimum than the baseline, a frozen arm is named as such and never picked, and no sentence says
 * "no difference detected" beside an interval that excludes no change.
 */
class VerdictOnBundledDataTest {

    @TempDir
    Path dir;

    @ParameterizedTest(name = "{0}")
    @CsvSource({"plans/wdbc.yaml, 0", "plans/iris.yaml, 0", "plans/wine.yaml, 0", "plans/optdigits.yaml, 10",
        "src/test/resources/plans/freeze.yaml, 0"})
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
        assertTrue(out.toString().startsWith("verdict (final gap"), out.toString());

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
