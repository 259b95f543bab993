package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A constant rate far above the stability bound on real data (bundled WDBC, logistic regression, 2/λmax ≈ 8.8):
 * at rate 50 the linearised prediction grows past 1e300 within a few epochs (it once made the distance chart's axis
 * infinite, so {@code settle run} wrote no report and still exited 0), and at rate 5000 every replicate diverges.
 * The run must still write its report, say where the prediction is unstable, and draw only finite coordinates; a
 * report that cannot be written is exit 1 with one line.
 */
class HighRateReportTest {

    @TempDir
    Path dir;

    private static String plan(String study) {
        return String.join("\n",
                "study: " + study,
                "seed: 11",
                "replicates: 2",
                "data:",
                "  source: bundled:wdbc",
                "  test-fraction: 0.2",
                "  standardize: true",
                "model:",
                "  kind: logistic",
                "  l2: 0.01",
                "training:",
                "  epochs: 12",
                "  batch: 32",
                "baseline: fifty",
                "arms:",
                "  - name: fifty",
                "    schedule: {kind: constant, rate: 50}",
                "  - name: five-thousand",
                "    schedule: {kind: constant, rate: 5000}",
                "");
    }

    @Test
    void aRateFarAboveTheBoundStillGetsItsReportWithFiniteCharts() throws Exception {
        Path planFile = dir.resolve("high.yaml");
        Files.writeString(planFile, plan("high"));
        Path study = dir.resolve("study");
        StringWriter err = new StringWriter();
        int code = StudyRunnerTest.settle(new StringWriter(), err, "run", planFile.toString(), "--out",
                study.toString(), "--quiet", "--threads", "1");
        assertEquals(3, code, "rate 5000 diverges, rate 50 finishes: " + err);
        assertFalse(err.toString().contains("report"), "nothing said about the report: " + err);
        String html = Files.readString(study.resolve("report.html"));
        String distance = html.substring(html.indexOf("<section id=\"distance\">"),
                html.indexOf("<section id=\"wander\">"));
        assertTrue(distance.contains("Unstable from update 1 (α·λmax = "), "the diagnosis of the rate-50 arm");
        assertFalse(distance.contains("class=\"series predicted\""), "no predicted curve from an unstable recursion");
        Matcher number = Pattern.compile("\\s(?:x|y|x1|x2|y1|y2|cx|cy|r|width|height)=\"([^\"]*)\"").matcher(html);
        int coordinates = 0;
        while (number.find()) {
            double v = Double.parseDouble(number.group(1));
            assertTrue(Math.abs(v) < 2000, "a sane coordinate: " + number.group());
            coordinates++;
        }
        assertTrue(coordinates > 100, "the charts were drawn");
        Matcher tick = Pattern.compile("<text class=\"tick\"[^>]*>([^<]*)</text>").matcher(distance);
        while (tick.find()) {
            double v = Double.parseDouble(tick.group(1).replace('−', '-'));
            assertTrue(v > 1e-12 && v < 1e12, "a distance tick within the measured range's decades: " + v);
        }
    }

    @Test
    void aReportThatCannotBeWrittenIsExitOneWithOneLine() throws Exception {
        Path planFile = dir.resolve("plan.yaml");
        Files.writeString(planFile, StudyRunnerTest.plan("blocked", 2, ""));
        Path study = dir.resolve("study");
        // report.html is a directory with a file in it: the report cannot be renamed into place.
        Files.createDirectories(study.resolve("report.html"));
        Files.writeString(study.resolve("report.html").resolve("keep"), "x");
        StringWriter err = new StringWriter();
        assertEquals(1, StudyRunnerTest.settle(new StringWriter(), err, "run", planFile.toString(), "--out",
                study.toString(), "--quiet", "--threads", "1"));
        String message = err.toString().trim();
        assertTrue(message.startsWith("settle run: the report was not written: "), message);
        assertTrue(message.endsWith("; the replicates are kept; rebuild it with settle report " + study), message);
        assertEquals(-1, message.indexOf('\n'), "one line: " + message);
        assertEquals(12, StudyFiles.replicateFiles(study).size(), "the replicates are kept");

        err = new StringWriter();
        assertEquals(1, StudyRunnerTest.settle(new StringWriter(), err, "report", study.toString()));
        assertEquals("settle report: cannot write " + study.resolve("report.html") + ": Is a directory",
                err.toString().trim());
    }
}
