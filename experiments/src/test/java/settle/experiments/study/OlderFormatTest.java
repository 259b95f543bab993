package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A study directory written in format 1 by an earlier settle: {@code settle run} neither resumes it nor writes beside
 * it, and {@code settle report} shows none of its numbers; both say so in one line and exit 2. {@code --fresh}
 * rewrites it in format 4. So is a directory in format 3, whose arm directories were named by position.
 */
class OlderFormatTest {

    @TempDir
    Path dir;

    private static final String WHY = " is in format 1, written by an earlier settle whose tail metrics came from"
            + " snapshots and whose reshuffling prediction was approximate; rerun it with `";

    /** Turns every JSON file of a study directory into format 1, as an earlier settle wrote it. */
    private static void makeFormatOne(Path study, Path only) throws Exception {
        makeFormat(study, only, 1);
    }

    /** Marks every JSON file of a study directory (or {@code only}) as of an earlier {@code format}. */
    private static void makeFormat(Path study, Path only, int format) throws Exception {
        List<Path> files = new ArrayList<>(StudyFiles.replicateFiles(study));
        files.add(study.resolve("manifest.json"));
        files.add(study.resolve("reference.json"));
        for (Path f : files) {
            if (only == null || f.equals(only)) {
                String text = Files.readString(f);
                String old = text.replace("\"format\" : 4,", "\"format\" : " + format + ",");
                assertFalse(old.equals(text), "format 4 written in " + f);
                Files.writeString(f, old);
            }
        }
    }

    /** @return every regular file of the study directory but the lock, with its bytes */
    private static Map<Path, byte[]> snapshot(Path study) throws Exception {
        Map<Path, byte[]> out = new LinkedHashMap<>();
        try (var walk = Files.walk(study)) {
            for (Path p : walk.sorted().toList()) {
                if (Files.isRegularFile(p) && !p.getFileName().toString().equals(".lock")) {
                    out.put(study.relativize(p), Files.readAllBytes(p));
                }
            }
        }
        return out;
    }

    @Test
    void runAndReportRefuseAFormatOneDirectoryInOneLineAndTouchNothing() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, StudyRunnerTest.plan("older", 3, ""));
        Path study = dir.resolve("study");
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "run", plan.toString(), "--out",
                study.toString(), "--quiet", "--threads", "1"));
        // A killed earlier run: one replicate missing, so a run would resume it.
        Files.delete(StudyFiles.arm(study, 2).resolve("3.json"));
        makeFormatOne(study, null);
        Map<Path, byte[]> before = snapshot(study);

        StringWriter err = new StringWriter();
        assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "run", plan.toString(), "--out",
                study.toString(), "--quiet", "--threads", "1"));
        assertEquals(study.resolve("manifest.json") + ": this study directory" + WHY + "settle run " + plan + " --out "
                + study + " --quiet --threads 1 --fresh` to rewrite it in format 4", err.toString().trim());
        Map<Path, byte[]> after = snapshot(study);
        assertEquals(before.keySet(), after.keySet(), "no file written or removed");
        for (Path p : before.keySet()) {
            assertArrayEquals(before.get(p), after.get(p), p + " unchanged");
        }

        err = new StringWriter();
        assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "report", study.toString()));
        assertEquals(study.resolve("manifest.json") + ": this study directory" + WHY + "settle run "
                + study.resolve("plan.yaml") + " --out " + study + " --fresh` to rewrite it in format 4",
                err.toString().trim());
        assertArrayEquals(before.get(Path.of("report.html")), Files.readAllBytes(study.resolve("report.html")),
                "the earlier report is left as it was");

        err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), err, "run", plan.toString(), "--out",
                study.toString(), "--quiet", "--threads", "1", "--fresh"), err.toString());
        StudySchema.validate(study);
    }

    @Test
    void runRefusesAFormatThreeDirectoryInOneLineAndFreshRewritesIt() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, StudyRunnerTest.plan("three", 3, ""));
        Path study = dir.resolve("study");
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "run", plan.toString(), "--out",
                study.toString(), "--quiet", "--threads", "1"));
        makeFormat(study, study.resolve("manifest.json"), 3);
        Map<Path, byte[]> before = snapshot(study);
        StringWriter err = new StringWriter();
        assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "run", plan.toString(), "--out",
                study.toString(), "--quiet", "--threads", "1"));
        assertEquals(study.resolve("manifest.json") + ": this study directory is in format 3, written by an earlier"
                + " settle whose arm directories are named by the arms' positions in the plan and whose binary files"
                + " hold every array as float64 (format 4 names each arm's directory by its specification, so that a"
                + " study can grow, and codes the arrays compactly, about half the bytes); rerun it with `settle run "
                + plan + " --out "
                + study + " --quiet --threads 1 --fresh` to rewrite it in format 4", err.toString().trim());
        assertEquals(before.keySet(), snapshot(study).keySet(), "no file written or removed");
        err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), err, "run", plan.toString(), "--out",
                study.toString(), "--quiet", "--threads", "1", "--fresh"), err.toString());
        StudySchema.validate(study);
    }

    @Test
    void aFormatOneReplicateFileInAFormatTwoDirectoryIsSetAsideAndTrainedAgain() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, StudyRunnerTest.plan("mixed", 3, ""));
        Path study = dir.resolve("study");
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "run", plan.toString(), "--out",
                study.toString(), "--quiet", "--threads", "1"));
        Path file = StudyFiles.arm(study, 3).resolve("2.json");
        byte[] whole = Files.readAllBytes(file);
        makeFormatOne(study, file);
        byte[] older = Files.readAllBytes(file);

        StringWriter err = new StringWriter();
        assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "report", study.toString()));
        assertEquals(file + ": format: this file is in format 1; this settle reads format 4; settle run "
                + study.resolve("plan.yaml") + " --out " + study + " sets invalid replicate files aside and trains them"
                + " again", err.toString().trim());

        err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), err, "run", plan.toString(), "--out",
                study.toString(), "--quiet"));
        assertEquals("settle run: " + file + ": format: this file is in format 1; this settle reads format 4; moved"
                + " aside to 2.json.quarantined-1 (with 2.bin.quarantined-1) and trained again", err.toString().trim());
        assertArrayEquals(whole, Files.readAllBytes(file), "trained again, byte for byte");
        assertArrayEquals(older, Files.readAllBytes(StudyFiles.arm(study, 3).resolve("2.json.quarantined-1")), "kept aside");
    }
}
