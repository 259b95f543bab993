package settle.cluster;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static settle.cluster.Studies.assertSameReplicateFiles;
import static settle.cluster.Studies.settle;

import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A driver killed with SIGKILL in the middle of a Spark study, then resumed: nothing finished is lost,
 * nothing is written twice, and the study ends equal to an uninterrupted run.
 */
class DriverKillTest {

    private static final ObjectMapper MAPPER = new ObjectMapper();
    private static final int REPLICATES = 12;
    private static final int TOTAL = 2 * REPLICATES;
    /** Replicate files the killed run must have written before it is killed. */
    private static final int FINISHED_BEFORE_KILL = 3;
    /** How long the killed run may take to get there (a Spark start on a busy machine included). */
    private static final long START_LIMIT_SECONDS = 180;
    /** SIGKILL is signal 9; a process killed by signal n exits with 128 + n. */
    private static final int KILLED_BY_SIGKILL = 128 + 9;

    @TempDir
    Path dir;

    /** What identifies one write of a file: its inode (an atomic rewrite renames a new one in) and mtime. */
    private record Written(Object fileKey, long modifiedNanos) {
        static Written of(Path file) throws Exception {
            BasicFileAttributes a = Files.readAttributes(file, BasicFileAttributes.class);
            return new Written(a.fileKey(), a.lastModifiedTime().to(TimeUnit.NANOSECONDS));
        }
    }

    @Test
    void aKilledDriverResumesWithNothingLostAndNothingWrittenTwice() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, Studies.mlpPlan("killed", REPLICATES));
        Path whole = dir.resolve("whole");
        Path killed = dir.resolve("killed");
        StringWriter err = new StringWriter();
        assertEquals(0, settle(new StringWriter(), err, "run", plan.toString(), "--out", whole.toString(), "--threads", "2",
                "--quiet"), err.toString());

        Path log = dir.resolve("driver.log");
        Process driver = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-cp", System.getProperty("java.class.path"),
                "-Dspark.local.dir=" + dir.resolve("spark-scratch"),
                "settle.experiments.cli.Main", "run", plan.toString(), "--out", killed.toString(),
                "--cluster", "local[2]", "--quiet")
                .redirectErrorStream(true).redirectOutput(log.toFile()).start();
        Map<Path, Written> atKill = new LinkedHashMap<>();
        try {
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(START_LIMIT_SECONDS);
            while (replicateFiles(killed).size() < FINISHED_BEFORE_KILL) {
                assertTrue(driver.isAlive(), "the driver ended before it was killed:\n" + Files.readString(log));
                assertTrue(System.nanoTime() < deadline, "the driver wrote no replicates in time:\n" + Files.readString(log));
                Thread.sleep(10);
            }
        } finally {
            driver.destroyForcibly(); // SIGKILL on Linux: no shutdown hook, no finally block runs in the driver
        }
        assertEquals(KILLED_BY_SIGKILL, driver.waitFor(), "the driver must die of SIGKILL, not finish");
        for (Path file : replicateFiles(killed)) {
            atKill.put(file, Written.of(file));
        }
        int finishedAtKill = atKill.size();
        System.out.println("driver killed with " + finishedAtKill + " of " + TOTAL + " replicates finished");
        assertTrue(finishedAtKill >= FINISHED_BEFORE_KILL && finishedAtKill < TOTAL,
                finishedAtKill + " of " + TOTAL + " replicates were finished when the driver was killed");
        for (Path file : atKill.keySet()) {
            assertEquals(Files.readString(whole.resolve(killed.relativize(file))), Files.readString(file),
                    "a replicate file the killed driver wrote differs from the uninterrupted run's: " + file);
        }

        StringWriter out = new StringWriter();
        assertEquals(0, settle(out, err, "run", plan.toString(), "--out", killed.toString(), "--cluster", "local[2]",
                "--quiet", "--json"), err.toString());
        assertEquals(TOTAL - finishedAtKill, MAPPER.readTree(out.toString()).path("trained_now").asInt(),
                "the resumed run must train exactly the replicates the killed one had not finished");
        for (Map.Entry<Path, Written> e : atKill.entrySet()) {
            assertEquals(e.getValue(), Written.of(e.getKey()), "the resumed run rewrote " + e.getKey());
        }
        assertEquals(TOTAL, replicateFiles(killed).size());
        // each replicate is a JSON file and its binary file
        assertEquals(2 * TOTAL, Studies.armFiles(killed).size(), "files other than replicate files left under arms/: "
                + Studies.armFiles(killed));
        assertSameReplicateFiles(whole, killed);
        assertEquals(Files.readString(whole.resolve("epochs.csv")), Files.readString(killed.resolve("epochs.csv")));
    }

    /** @return the finished replicate files (not the temporary files of writes in progress) */
    private static List<Path> replicateFiles(Path study) throws Exception {
        List<Path> files = new ArrayList<>();
        for (Path p : Studies.armFiles(study)) {
            String name = p.getFileName().toString();
            // a write in progress is a hidden ".N.json.….partial" file
            if (name.endsWith(".json") && !name.startsWith(".")) {
                files.add(p);
            }
        }
        return files;
    }
}
