package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** settle run writes report.html and summary.csv; settle report rebuilds them, with its exit codes. */
class ReportAfterRunTest {

    @TempDir
    Path dir;

    @Test
    void runWritesTheReportAndReportRebuildsIt() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, StudyRunnerTest.plan("reported", 3, ""));
        Path study = dir.resolve("study");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(out, err, "run", plan.toString(), "--out", study.toString(), "--quiet",
                "--threads", "1"), err.toString());
        // run ends with the verdict and the report's path on stdout
        String said = out.toString();
        assertTrue(said.startsWith("verdict (final gap of the returned iterate against the baseline "), said);
        assertTrue(said.endsWith("report: " + study.resolve("report.html").toAbsolutePath().normalize()
                + System.lineSeparator()), said);
        assertTrue(Files.readString(study.resolve("report.html")).contains("<section id=\"verdict\">"));
        assertTrue(Files.readString(study.resolve("summary.csv")).startsWith("arm,metric,median,iqm,effect,unit,ci_low,ci_high,ci_level,p,p_adjusted\r\n"));
        // The arm name with a comma is quoted in summary.csv.
        assertTrue(Files.readString(study.resolve("summary.csv")).contains("\"reciprocal, per update\",tail_radius,"));

        Files.delete(study.resolve("report.html"));
        out = new StringWriter();
        err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(out, err, "report", study.toString()), err.toString());
        assertTrue(out.toString().startsWith("verdict (final gap"), out.toString());
        assertTrue(out.toString().contains("report: " + study.resolve("report.html").toAbsolutePath().normalize()),
                out.toString());
        assertTrue(out.toString().contains("summary: "), out.toString());
        assertTrue(Files.exists(study.resolve("report.html")));

        Files.delete(StudyFiles.arm(study, 2).resolve("3.json"));
        err = new StringWriter();
        assertEquals(3, StudyRunnerTest.settle(new StringWriter(), err, "report", study.toString()));
        assertTrue(err.toString().contains("partial study: 1 of 12 replicates missing"), err.toString());

        err = new StringWriter();
        assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "report", dir.resolve("nothing").toString()));
        assertEquals(dir.resolve("nothing") + ": no such study directory", err.toString().trim());
    }
}
