package settle.reports.format;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The one atomic writer: whole files only, the mode every other file gets, temporary files that a killed writer
 * leaves are removed (by its shutdown hook when it can run one, else by the next cleaner), never a live writer's.
 */
class AtomicFileTest {

    @TempDir
    Path dir;

    /** @return the temporary files in {@code d} */
    static List<Path> temporaries(Path d) throws IOException {
        try (var s = Files.list(d)) {
            return s.filter(p -> AtomicFile.isTemporary(p.getFileName().toString())).toList();
        }
    }

    @Test
    void replacesWholeFilesWithTheUsualModeAndLeavesNoTemporary() throws Exception {
        Path target = dir.resolve("arms/1/3.json");
        AtomicFile.write(target, "{\"a\": 1}");
        AtomicFile.write(target, "{\"a\": 2}");
        assertEquals("{\"a\": 2}", Files.readString(target));
        try (var s = Files.list(target.getParent())) {
            assertEquals(List.of(target), s.toList());
        }
        // the same mode as a file made the ordinary way in the same directory (0644 under umask 022), not 0600
        Path ordinary = Files.writeString(target.resolveSibling("ordinary"), "x");
        assertEquals(PosixFilePermissions.toString(Files.getPosixFilePermissions(ordinary)),
                PosixFilePermissions.toString(Files.getPosixFilePermissions(target)));
    }

    @Test
    void removesOnlyTheLeftoversOfWritersThatAreNoLongerAlive() throws Exception {
        Process ended = new ProcessBuilder("true").start();
        ended.waitFor();
        Path dead = Files.writeString(dir.resolve(".report.html." + ended.pid() + ".7" + AtomicFile.TEMP_SUFFIX), "half");
        Path mine = Files.writeString(dir.resolve(".report.html." + ProcessHandle.current().pid() + ".8"
                + AtomicFile.TEMP_SUFFIX), "in flight");
        Path other = Files.writeString(dir.resolve("notes" + AtomicFile.TEMP_SUFFIX), "not ours");
        assertEquals(1, AtomicFile.removeLeftovers(dir));
        assertFalse(Files.exists(dead));
        assertTrue(Files.exists(mine), "a live writer's temporary file is never removed");
        assertTrue(Files.exists(other), "a file not named as ours is left alone");
    }

    @Test
    void aWriterStoppedByASignalRemovesItsTemporaryFile() throws Exception {
        Process child = startWriter(dir.resolve("report.html"));
        assertEquals(1, temporaries(dir).size(), "killed in the middle of the write");
        child.destroy(); // SIGTERM: the JVM runs its shutdown hooks
        assertTrue(child.waitFor(60, TimeUnit.SECONDS));
        assertEquals(List.of(), temporaries(dir));
        assertFalse(Files.exists(dir.resolve("report.html")), "nothing half-written under the real name");
    }

    @Test
    void aWriterKilledOutrightLeavesItsTemporaryFileToTheNextCleaner() throws Exception {
        Process child = startWriter(dir.resolve("report.html"));
        child.destroyForcibly(); // SIGKILL: no hook runs
        assertTrue(child.waitFor(60, TimeUnit.SECONDS));
        assertEquals(1, temporaries(dir).size(), "a SIGKILL leaves the temporary file");
        assertEquals(1, AtomicFile.removeLeftovers(dir));
        assertEquals(List.of(), temporaries(dir));
    }

    /** Starts {@link Writer} on {@code target} and returns once it is in the middle of writing. */
    static Process startWriter(Path target) throws IOException {
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        Process child = new ProcessBuilder(List.of(java, "-cp", System.getProperty("java.class.path"),
                Writer.class.getName(), target.toString())).redirectErrorStream(true).start();
        BufferedReader out = new BufferedReader(new InputStreamReader(child.getInputStream(), StandardCharsets.UTF_8));
        assertEquals("writing", out.readLine());
        return child;
    }

    /** Child process: writes part of a file through {@link AtomicFile}, says so, and waits to be stopped. */
    public static final class Writer {
        public static void main(String[] args) throws IOException {
            AtomicFile.write(Path.of(args[0]), out -> {
                out.write("<!DOCTYPE html>\n<html>".getBytes(StandardCharsets.UTF_8));
                out.flush();
                System.out.println("writing");
                System.out.flush();
                try {
                    Thread.sleep(Long.MAX_VALUE);
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                }
            });
        }
    }
}
