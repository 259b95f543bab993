package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code nudge} takes exactly one of {@code --factor} and {@code --rate}: an argument group, not a check by hand. */
class NudgeOptionsTest {

    @Test
    void bothOrNeitherIsOneLineAndExitTwo(@TempDir Path study) {
        Cli.Result both = Cli.run("nudge", study.toString(), "--arm", "a", "--factor", "0.5", "--rate", "0.1");
        assertEquals(Main.BAD_INPUT, both.code());
        assertEquals(1, both.err().strip().lines().count(), both.err());
        assertTrue(both.err().startsWith("settle nudge: --factor=F, --rate=R are mutually exclusive"), both.err());
        Cli.Result neither = Cli.run("nudge", study.toString(), "--arm", "a");
        assertEquals(Main.BAD_INPUT, neither.code());
        assertEquals(1, neither.err().strip().lines().count(), neither.err());
        assertTrue(neither.err().contains("(--factor=F | --rate=R)"), neither.err());
    }

    @Test
    void oneOfThemPassesToTheStudyCheck(@TempDir Path study) {
        // an empty folder is not a study: the options were accepted and the command got as far as the study
        Cli.Result r = Cli.run("nudge", study.toString(), "--arm", "a", "--rate", "0.1", "--wait", "0");
        assertEquals(Main.BAD_INPUT, r.code());
        assertTrue(r.err().contains(": not a study directory"), r.err());
    }
}
