package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.experiments.cli.Main;
import settle.reports.format.AtomicFile;

class StudyRunnerTest {

    private static final ObjectMapper MAPPER = new ObjectMapper();

    @TempDir
    Path dir;

    /** A small convex plan: 3 arms × 4 replicates of logistic regression on seeded Gaussian classes. */
    static String plan(String study, int epochs, String extraArm) {
        return String.join("\n",
                "study: " + study,
                "seed: 7",
                "replicates: 4",
                "data:",
                "  source: synthetic:gaussian?rows=240&features=3&classes=2&separation=1.5&seed=3",
                "  test-fraction: 0.25",
                "  standardize: true",
                "model:",
                "  kind: logistic",
                "  l2: 0.01",
                "training:",
                "  epochs: " + epochs,
                "  batch: 8",
                "  snapshots: 20",
                "baseline: constant",
                "arms:",
                "  - name: constant",
                "    schedule: {kind: constant, rate: 0.3}",
                "  - name: 'reciprocal, per update'",
                "    schedule: {kind: reciprocal, rate: 0.3, decay: 0.01, per: update}",
                "  - name: averaged",
                "    schedule: {kind: constant, rate: 0.3}",
                "    average: tail",
                extraArm,
                "");
    }

    static int settle(StringWriter out, StringWriter err, String... args) {
        return Main.run(new PrintWriter(out), new PrintWriter(err), args);
    }

    @Test
    void replicateFilesAreByteIdenticalOnOneAndTwoThreads() throws Exception {
        Path planFile = dir.resolve("plan.yaml");
        Files.writeString(planFile, plan("threads", 6, ""));
        Path one = dir.resolve("one");
        Path two = dir.resolve("two");
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out", one.toString(),
                "--threads", "1", "--quiet"));
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out", two.toString(),
                "--threads", "2", "--quiet"));
        assertEquals(12, StudyFiles.replicateFiles(one).size());
        StudyFiles.assertSameReplicateFiles(one, two);
        assertArrayEquals(Files.readAllBytes(one.resolve("epochs.csv")), Files.readAllBytes(two.resolve("epochs.csv")));
        assertEquals(1, MAPPER.readTree(one.resolve("manifest.json").toFile()).path("threads").asInt());
        assertEquals(2, MAPPER.readTree(two.resolve("manifest.json").toFile()).path("threads").asInt());
    }

    @Test
    void seedPairingGivesEveryArmTheSameStartAndSeedsForReplicateK() throws Exception {
        Path planFile = dir.resolve("plan.yaml");
        Files.writeString(planFile, plan("paired", 3, ""));
        Path study = dir.resolve("s");
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out", study.toString(),
                "--quiet"));
        for (int k = 1; k <= 4; k++) {
            JsonNode first = StudyFiles.replicate(StudyFiles.arm(study, 1).resolve(k + ".json"));
            for (int arm = 2; arm <= 3; arm++) {
                JsonNode other = StudyFiles.replicate(StudyFiles.arm(study, arm).resolve(k + ".json"));
                assertEquals(first.path("seeds"), other.path("seeds"));
                assertEquals(first.path("start"), other.path("start"));
            }
        }
        JsonNode r1 = StudyFiles.replicate(StudyFiles.arm(study, 1).resolve("1.json"));
        JsonNode r2 = StudyFiles.replicate(StudyFiles.arm(study, 1).resolve("2.json"));
        assertFalse(r1.path("seeds").equals(r2.path("seeds")));
    }

    @Test
    void aResumedRunTrainsOnlyWhatIsMissingAndMatchesAnUninterruptedOne() throws Exception {
        Path planFile = dir.resolve("plan.yaml");
        Files.writeString(planFile, plan("resume", 4, ""));
        Path whole = dir.resolve("whole");
        Path resumed = dir.resolve("resumed");
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out", whole.toString(),
                "--quiet"));
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out", resumed.toString(),
                "--quiet"));
        Files.delete(StudyFiles.arm(resumed, 2).resolve("3.json"));
        Files.delete(StudyFiles.arm(resumed, 3).resolve("1.json"));
        // what a writer killed outright leaves: a temporary file named with its (no longer live) pid
        String leftover = ".1.json." + deadPid() + ".1" + AtomicFile.TEMP_SUFFIX;
        Files.writeString(StudyFiles.arm(resumed, 3).resolve(leftover), "{\"half");
        StringWriter out = new StringWriter();
        assertEquals(0, settle(out, new StringWriter(), "run", planFile.toString(), "--out", resumed.toString(), "--quiet",
                "--json"));
        JsonNode summary = MAPPER.readTree(out.toString());
        assertEquals(2, summary.path("trained_now").asInt());
        assertEquals(12, summary.path("finished").asInt());
        // the verdict travels with it: the report's path, the primary metric, the pick, each arm's effect
        assertEquals(resumed.resolve("report.html").toAbsolutePath().normalize().toString(),
                summary.path("report").asText());
        assertEquals("final_gap", summary.path("primary_metric").asText());
        assertTrue(summary.has("pick"), out.toString());
        assertEquals(2, summary.path("arms").size(), "every arm but the baseline");
        for (JsonNode arm : summary.path("arms")) {
            assertTrue(arm.path("p_adjusted").isNumber() && arm.path("ci_level").isNumber(), arm.toString());
            assertTrue(arm.path("headline").asText().startsWith("ends "), arm.toString());
        }
        StudyFiles.assertSameReplicateFiles(whole, resumed);
        assertFalse(Files.exists(StudyFiles.arm(resumed, 3).resolve(leftover)));
    }

    @Test
    void aChangedPlanIsRefusedUnlessFresh() throws Exception {
        Path planFile = dir.resolve("plan.yaml");
        Files.writeString(planFile, plan("changed", 2, ""));
        Path study = dir.resolve("s");
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out", study.toString(),
                "--quiet"));
        Files.writeString(planFile, plan("changed", 3, ""));
        StringWriter err = new StringWriter();
        assertEquals(2, settle(new StringWriter(), err, "run", planFile.toString(), "--out", study.toString(), "--quiet"));
        assertEquals(study + ": changed since this study was run: training.epochs: 3 (was 2); a study grows (arms,"
                + " replicates) only while its seed, data, model and training stay the same: use --fresh to discard its"
                + " results, or --out DIR for a new study", err.toString().trim());
        assertEquals(2, StudyFiles.replicate(StudyFiles.arm(study, 1).resolve("1.json")).path("epochs").path("epoch").size(),
                "the refused run must not touch the results");
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out", study.toString(),
                "--quiet", "--fresh"));
        assertEquals(3, StudyFiles.replicate(StudyFiles.arm(study, 1).resolve("1.json")).path("epochs").path("epoch").size());
    }

    @Test
    void aLiveRunHoldsTheDirectory() throws Exception {
        Path planFile = dir.resolve("plan.yaml");
        Files.writeString(planFile, plan("locked", 2, ""));
        Path study = dir.resolve("s");
        try (StudyLock held = StudyLock.acquire(study)) {
            StringWriter err = new StringWriter();
            assertEquals(1, settle(new StringWriter(), err, "run", planFile.toString(), "--out", study.toString(), "--quiet"));
            assertTrue(err.toString().startsWith("settle run: " + study + ": another run is active here (process "),
                    err.toString());
        }
    }

    @Test
    void aDivergingArmEndsDivergedWithItsUpdateWhileTheOthersFinish() throws Exception {
        // α·λ = 300 · 0.01 = 3 > 2 on the L2 term: the weights grow by |1 − αλ| = 2 per update until the
        // objective passes 1e6·F(θ₀) (an L2-logistic model below α·λ = 2 would only oscillate).
        Path planFile = dir.resolve("plan.yaml");
        Files.writeString(planFile, plan("diverging", 3, String.join("\n",
                "  - name: too-fast",
                "    schedule: {kind: constant, rate: 300}")));
        Path study = dir.resolve("s");
        StringWriter out = new StringWriter();
        assertEquals(3, settle(out, new StringWriter(), "run", planFile.toString(), "--out", study.toString(), "--quiet",
                "--json"));
        JsonNode summary = MAPPER.readTree(out.toString());
        assertEquals(4, summary.path("diverged").asInt());
        assertEquals(12, summary.path("finished").asInt());
        for (int k = 1; k <= 4; k++) {
            JsonNode r = StudyFiles.replicate(StudyFiles.arm(study, 4).resolve(k + ".json"));
            assertEquals("diverged", r.path("status").asText());
            long at = r.path("diverged_at_update").asLong();
            assertTrue(at >= 1 && at < r.path("total_updates").asLong(), "diverged at " + at);
            // a batch loss that fails stops before its update is applied; an epoch-end objective after it
            long ran = r.path("updates_run").asLong();
            assertTrue(ran == at - 1 || ran == at, "ran " + ran + " updates, diverged at " + at);
            assertTrue(r.path("metrics").path("tail_radius").isNull());
        }
        JsonNode manifest = MAPPER.readTree(study.resolve("manifest.json").toFile());
        int divergedInManifest = 0;
        for (JsonNode rep : manifest.path("replicates")) {
            divergedInManifest += rep.path("status").asText().equals("diverged") ? 1 : 0;
        }
        assertEquals(4, divergedInManifest);
    }

    @Test
    void aRunKilledWithSigkillAtSeveralPointsResumesToTheSameFiles() throws Exception {
        Path planFile = dir.resolve("plan.yaml");
        Files.writeString(planFile, plan("killed", 60, ""));
        Path whole = dir.resolve("whole");
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out", whole.toString(),
                "--quiet"));
        Path study = dir.resolve("killed");
        int[] killAfter = {0, 1, 5};
        int previous = -1;
        for (int after : killAfter) {
            Process child = childRun(planFile, study);
            try {
                long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
                while (count(study) < after && child.isAlive() && System.nanoTime() < deadline) {
                    Thread.sleep(2);
                }
            } finally {
                child.destroyForcibly(); // SIGKILL: no shutdown hook runs
                assertTrue(child.waitFor(30, TimeUnit.SECONDS));
            }
            int found = count(study);
            assertTrue(found >= previous, "finished replicates were lost: " + found + " < " + previous);
            previous = found;
        }
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out", study.toString(),
                "--quiet"));
        StudyFiles.assertSameReplicateFiles(whole, study);
    }

    @Test
    void ctrlCStopsCleanlyWithExitCode130AndKeepsWholeFiles() throws Exception {
        Path planFile = dir.resolve("plan.yaml");
        // long enough that the run is still going when the signal arrives: the arms of a replicate train together,
        // so the files appear three at a time, and starting `kill` can take a while on a loaded machine
        Files.writeString(planFile, plan("interrupted", 600, ""));
        Path study = dir.resolve("s");
        String java = ProcessHandle.current().info().command().orElse("java");
        Path log = dir.resolve("child.log");
        Process child = new ProcessBuilder(List.of(java, "-cp", System.getProperty("java.class.path"), Main.class.getName(),
                "run", planFile.toString(), "--out", study.toString(), "--threads", "1", "--quiet"))
                .redirectErrorStream(true).redirectOutput(log.toFile()).start();
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
        while (count(study) < 2 && child.isAlive() && System.nanoTime() < deadline) {
            Thread.sleep(2);
        }
        assertTrue(child.isAlive(), "the run ended before it could be interrupted");
        new ProcessBuilder("kill", "-INT", Long.toString(child.pid())).start().waitFor();
        assertTrue(child.waitFor(30, TimeUnit.SECONDS));
        assertEquals(130, child.exitValue());
        int kept = count(study);
        String said = Files.readString(log).trim();
        assertTrue(said.matches("(?s).*settle: interrupted; \\d+ of 12 replicates are written and kept in .*; run the same "
                + "command again to train the rest"), said);
        for (Path f : StudyFiles.replicateFiles(study)) {
            MAPPER.readTree(f.toFile()); // every file kept is whole JSON
        }
        assertTrue(kept >= 2 && kept < 12, "kept " + kept);
        assertEquals(0, settle(new StringWriter(), new StringWriter(), "run", planFile.toString(), "--out", study.toString(),
                "--quiet"));
        assertEquals(12, count(study));
    }

    private static int count(Path study) throws Exception {
        if (!Files.isDirectory(study.resolve("arms"))) {
            return 0;
        }
        return StudyFiles.replicateFiles(study).size();
    }

    private static Process childRun(Path planFile, Path study) throws Exception {
        String java = ProcessHandle.current().info().command().orElse("java");
        return new ProcessBuilder(List.of(java, "-cp", System.getProperty("java.class.path"), Main.class.getName(),
                "run", planFile.toString(), "--out", study.toString(), "--threads", "1", "--quiet"))
                .redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
    }

    /** @return the pid of a process that has ended */
    static long deadPid() throws Exception {
        Process p = new ProcessBuilder("true").start();
        p.waitFor();
        return p.pid();
    }
}
