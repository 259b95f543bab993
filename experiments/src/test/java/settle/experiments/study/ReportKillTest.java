package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.ArrayList;
import java.util.List;
import java.util.TreeSet;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.format.AtomicFile;

/**
 * {@code settle report} killed at any moment leaves no temporary file behind for good: the next run or report on the
 * directory removes what a killed writer left (the mechanics, with a writer held in the middle of a write, are in
 * the reports module's {@code AtomicFileTest}); and every file of a study directory gets the same mode.
 */
class ReportKillTest {

    @TempDir
    Path dir;

    /** @return the names of the temporary files in the study directory (names only: a writer may remove one) */
    private static List<String> temporaries(Path study) throws Exception {
        List<String> out = new ArrayList<>();
        try (var entries = Files.newDirectoryStream(study)) {
            for (Path p : entries) {
                if (AtomicFile.isTemporary(p.getFileName().toString())) {
                    out.add(p.getFileName().toString());
                }
            }
        }
        return out;
    }

    /** @return true once {@code report} has a temporary file of its own in the study directory */
    private static boolean writing(Path study, Process report) throws Exception {
        for (String name : temporaries(study)) {
            if (name.contains("." + report.pid() + ".")) {
                return true;
            }
        }
        return false;
    }

    private Path study() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, StudyRunnerTest.plan("killed", 3, ""));
        Path study = dir.resolve("study");
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "run", plan.toString(), "--out",
                study.toString(), "--quiet", "--threads", "1"));
        return study;
    }

    @Test
    void aKilledReportLeavesNoTemporaryFileBehind() throws Exception {
        Path study = study();
        // what SIGKILL leaves in the middle of a write: temporary files named with a pid that is no longer alive
        long dead = StudyRunnerTest.deadPid();
        Files.writeString(study.resolve(".report.html." + dead + ".3" + AtomicFile.TEMP_SUFFIX), "<!DOCTYPE");
        Files.writeString(study.resolve(".summary.csv." + dead + ".2" + AtomicFile.TEMP_SUFFIX), "");
        // and real settle report processes killed with SIGKILL at once, or as soon as they start writing
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        for (int attempt = 0; attempt < 3; attempt++) {
            Process report = new ProcessBuilder(List.of(java, "-cp", System.getProperty("java.class.path"),
                    "settle.experiments.cli.Main", "report", study.toString())).redirectErrorStream(true)
                    .redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
            while (attempt > 0 && report.isAlive() && !writing(study, report) && System.nanoTime() < deadline) {
                Thread.onSpinWait();
            }
            report.destroyForcibly();
            assertTrue(report.waitFor(60, TimeUnit.SECONDS));
        }

        StringWriter err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), err, "report", study.toString()), err.toString());
        assertEquals(List.of(), temporaries(study), "the next report removes what killed writers left");
        assertTrue(Files.readString(study.resolve("report.html")).endsWith("</html>\n"), "the report is whole");
    }

    @Test
    void everyFileOfAStudyHasTheSameMode() throws Exception {
        Path study = study();
        TreeSet<String> modes = new TreeSet<>();
        List<String> files = new ArrayList<>();
        try (var walk = Files.walk(study)) {
            for (Path p : walk.filter(Files::isRegularFile).toList()) {
                modes.add(PosixFilePermissions.toString(Files.getPosixFilePermissions(p)));
                files.add(study.relativize(p).toString());
            }
        }
        assertTrue(files.contains("report.html") && files.contains("summary.csv") && files.contains("manifest.json"),
                files.toString());
        assertEquals(1, modes.size(), "one mode for " + files + ": " + modes);
        Path ordinary = Files.writeString(dir.resolve("ordinary"), "x");
        assertEquals(PosixFilePermissions.toString(Files.getPosixFilePermissions(ordinary)), modes.first(),
                "the mode the umask gives any new file (0644 under umask 022)");
    }
}
