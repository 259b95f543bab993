package settle.experiments.run;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;

/** The progress display follows what the launcher says of stderr, not the console check on stdin and stdout. */
class ProgressModeTest {

    @Test
    void stderrDecides() {
        assertEquals(Progress.Mode.LINES, Progress.choose(false, "file", true), "2>log on a terminal: lines");
        assertEquals(Progress.Mode.BAR, Progress.choose(false, "terminal", false), "stdout redirected: still a bar");
        assertEquals(Progress.Mode.BAR, Progress.choose(false, null, true), "no word from the launcher: the console");
        assertEquals(Progress.Mode.LINES, Progress.choose(false, null, false));
        assertEquals(Progress.Mode.QUIET, Progress.choose(true, "terminal", true));
    }

    @Test
    void theLauncherTellsJavaWhatStderrIs() throws Exception {
        String launcher = Files.readString(Path.of("..", "settle"));
        assertEquals(true, launcher.contains("if [ -t 2 ]; then stderr_kind=terminal; else stderr_kind=file; fi"));
        assertEquals(true, launcher.contains("-Dsettle.stderr=$stderr_kind"));
    }
}
