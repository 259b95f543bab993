package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.format.StudyFormat;

/**
 * One rule decides whether a display redraws in place: the stream it is drawn on, as the launcher reports it
 * ({@link Terminal}); {@code run}'s progress bar (stderr) and {@code follow}'s view (stdout) both use it.
 */
class TerminalTest {

    private static final String CLEAR = "\033[H\033[2J";

    @Test
    void theLaunchersWordDecidesAndTheConsoleOnlyWithoutIt() {
        assertFalse(Terminal.decide("file", true), "2>log on a terminal: the console is there, the stream is a file");
        assertTrue(Terminal.decide("terminal", false), "stdout redirected, stderr a terminal: still a terminal");
        assertTrue(Terminal.decide(null, true), "java -jar by hand: the console check");
        assertFalse(Terminal.decide(null, false));
    }

    @Test
    void theLauncherAsksTheShellAboutEachStreamAndPassesBoth() throws Exception {
        String launcher = Files.readString(Path.of("..", "settle"), StandardCharsets.UTF_8);
        assertTrue(launcher.contains("if [ -t 1 ]; then stdout_kind=terminal; else stdout_kind=file; fi"));
        assertTrue(launcher.contains("if [ -t 2 ]; then stderr_kind=terminal; else stderr_kind=file; fi"));
        String streams = "streams=\"-D" + Terminal.STDOUT.property() + "=$stdout_kind -D" + Terminal.STDERR.property()
                + "=$stderr_kind\"";
        assertTrue(launcher.contains(streams), streams);
        // both ways of starting java pass them
        assertEquals(2, launcher.split(" \\$streams ", -1).length - 1);
    }

    @Test
    void followRedrawsOnlyWhenItsStdoutIsATerminal(@TempDir Path study) throws Exception {
        Files.writeString(study.resolve(StudyFormat.PROGRESS), "{\"study\": \"s\", \"running\": false,"
                + " \"updated\": \"2026-01-01T00:00:00Z\", \"epochs\": 4, \"arms\": [{\"index\": 1, \"name\": \"a\","
                + " \"manual\": false, \"state\": \"finished\", \"finished\": 3, \"replicates\": 3, \"diverged\": 0}]}",
                StandardCharsets.UTF_8);
        String onTerminal = follow(study, "terminal");
        assertTrue(onTerminal.startsWith(CLEAR), onTerminal);
        assertTrue(onTerminal.contains("  #1   a  finished  3/3 replicates written"), onTerminal);
        String toFile = follow(study, "file");
        assertFalse(toFile.contains("\033"), toFile);
        assertTrue(toFile.startsWith("#1 a: finished, 3/3 replicates written\n"), toFile);
        assertTrue(toFile.endsWith("study s: the run has ended\n"), toFile);
    }

    /** @return what {@code settle follow STUDY} prints with the launcher saying stdout is {@code kind} */
    private static String follow(Path study, String kind) {
        String before = System.getProperty(Terminal.STDOUT.property());
        System.setProperty(Terminal.STDOUT.property(), kind);
        try {
            Cli.Result r = Cli.run("follow", study.toString());
            assertEquals(Main.OK, r.code(), r.err());
            return r.out();
        } finally {
            if (before == null) {
                System.clearProperty(Terminal.STDOUT.property());
            } else {
                System.setProperty(Terminal.STDOUT.property(), before);
            }
        }
    }
}
