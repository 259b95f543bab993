package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * What settle writes without being told where lands under {@code studies/} in the current directory, and a checkout
 * of settle ignores {@code studies/} at any depth: {@code ./settle demo}, {@code run} or {@code probe} started
 * anywhere in the checkout leave its tracked and untracked source as they were.
 */
class PlacesTest {

    @Test
    void everyDefaultOutputIsUnderStudies() {
        assertEquals(Path.of("studies", "frost-demo"), Places.study("frost-demo"));
        assertEquals(Path.of("studies", "satellite-mlp-probe.html"), Places.probePage("satellite-mlp"));
        assertTrue(Places.probePage("x").startsWith(Places.STUDIES));
        assertEquals(Path.of("studies", "compare.html"), Places.COMPARISON);
        assertEquals(Path.of("studies", "compare.csv"), Places.besidePage(Places.COMPARISON));
        assertEquals(Path.of("out", "page.htm.csv"), Places.besidePage(Path.of("out", "page.htm")));
    }

    @Test
    void theCheckoutIgnoresStudiesAtAnyDepth() throws Exception {
        // tests run in the module's folder; the checkout's .gitignore is one up. A pattern with a slash only at its
        // end matches a folder of that name at any depth (gitignore(5)), so experiments/studies/ is ignored too.
        List<String> lines = Files.readAllLines(Path.of("..", ".gitignore"), StandardCharsets.UTF_8);
        assertTrue(lines.contains(Places.STUDIES + "/"), lines.toString());
    }

    @Test
    void theHelpSaysWhereEachDefaultIs() {
        String probe = Cli.run("probe", "--help").out();
        assertTrue(probe.contains("(default: studies/<study>-probe.html)"), probe);
        String run = Cli.run("run", "--help").out();
        assertTrue(run.contains("(default: studies/<study>)"), run);
        String compare = Cli.run("compare", "--help").out();
        assertTrue(compare.contains("(default: studies/compare.html)"), compare);
    }
}
