package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class StudyLockTest {

    @TempDir
    Path dir;

    @Test
    void secondHolderInTheSameProcessIsRefusedUntilTheFirstCloses() throws Exception {
        try (StudyLock first = StudyLock.acquire(dir)) {
            StudyLock.LockHeldException e = assertThrows(StudyLock.LockHeldException.class, () -> StudyLock.acquire(dir));
            assertTrue(e.getMessage().contains("another run is active here"), e.getMessage());
            assertTrue(e.getMessage().contains(String.valueOf(ProcessHandle.current().pid())), e.getMessage());
        }
        try (StudyLock again = StudyLock.acquire(dir)) {
            assertTrue(Files.readString(dir.resolve(StudyLock.FILE)).startsWith(ProcessHandle.current().pid() + "@"));
        }
    }

    @Test
    void aLiveChildHoldsTheLockAndAKilledChildDoesNot() throws Exception {
        String java = ProcessHandle.current().info().command().orElse("java");
        Process child = new ProcessBuilder(List.of(java, "-cp", System.getProperty("java.class.path"),
                LockHolder.class.getName(), dir.toString())).redirectErrorStream(true).start();
        try (BufferedReader out = new BufferedReader(new InputStreamReader(child.getInputStream(), StandardCharsets.UTF_8))) {
            assertEquals("locked", out.readLine());
            StudyLock.LockHeldException e = assertThrows(StudyLock.LockHeldException.class, () -> StudyLock.acquire(dir));
            assertTrue(e.getMessage().contains("process " + child.pid() + "@"), e.getMessage());
            child.destroyForcibly(); // SIGKILL: no shutdown hook, no close
            assertTrue(child.waitFor(30, TimeUnit.SECONDS));
        }
        try (StudyLock mine = StudyLock.acquire(dir)) {
            assertTrue(Files.readString(dir.resolve(StudyLock.FILE)).startsWith(ProcessHandle.current().pid() + "@"));
        }
    }

    /** Child process: takes the lock, says so, and waits to be killed. */
    public static final class LockHolder {
        public static void main(String[] args) throws Exception {
            StudyLock lock = StudyLock.acquire(Path.of(args[0]));
            System.out.println("locked");
            System.out.flush();
            Thread.sleep(120_000);
            lock.close();
        }
    }
}
