package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;
import settle.input.BadInputException;
import settle.experiments.plan.PlanParser;

/**
 * The corpus of bad plans under {@code bad-plans/}: each gives exactly the message and exit code listed in
 * {@code expected-messages.txt}, through {@code settle check}, and every message has the required shape.
 */
class BadPlansTest {

    /** The corpus must hold at least this many plans (issue 4). */
    static final int MINIMUM_CORPUS = 30;

    /** file.yaml:LINE:COLUMN: [key.path: ]detail, or file.yaml: key.path: detail. */
    static final Pattern SHAPE = Pattern.compile(
            "^([A-Za-z0-9_.-]+\\.yaml)(?::(\\d+):(\\d+))?: (?:([A-Za-z0-9_.\\[\\]-]+): )?(.+)$");

    /** Words that say what would be accepted (or how to fix it). */
    static final Pattern ACCEPTED = Pattern.compile(
            "accepted|expected|must be|did you mean|one of|needs|such as|name one|give|write|remove|quote|"
                    + "indent|close it|set |put all|unique|at least|no such file");

    static Path corpus() {
        try {
            return Path.of(BadPlansTest.class.getResource("/bad-plans").toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    /** @return file name → {exit code, message with ${dir} replaced} */
    static Map<String, String[]> expected() throws IOException {
        Path dir = corpus();
        Map<String, String[]> out = new TreeMap<>();
        for (String line : Files.readAllLines(dir.resolve("expected-messages.txt"), StandardCharsets.UTF_8)) {
            if (line.startsWith("#") || line.isBlank()) {
                continue;
            }
            String[] parts = line.split("\t", 2);
            String message = parts[1].replace("${dir}", dir.toString());
            String file = message.substring(0, message.indexOf(".yaml") + 5);
            String[] previous = out.put(file, new String[] {parts[0], message});
            assertEquals(null, previous, "one expected message per plan: " + file);
        }
        return out;
    }

    static String[] run(Path workingDir, String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.run(new PrintWriter(out), new PrintWriter(err), args);
        return new String[] {Integer.toString(code), out.toString(), err.toString()};
    }

    @Test
    void everyPlanInTheCorpusHasAnExpectedMessage() throws IOException {
        TreeSet<String> files = new TreeSet<>();
        try (Stream<Path> s = Files.list(corpus())) {
            s.filter(p -> p.toString().endsWith(".yaml")).forEach(p -> files.add(p.getFileName().toString()));
        }
        assertEquals(files, new TreeSet<>(expected().keySet()));
        assertTrue(files.size() >= MINIMUM_CORPUS, files.size() + " bad plans");
    }

    @TestFactory
    List<DynamicTest> checkGivesTheExactMessageAndExitCode() throws IOException {
        Path dir = corpus();
        List<DynamicTest> tests = new ArrayList<>();
        for (Map.Entry<String, String[]> e : expected().entrySet()) {
            tests.add(DynamicTest.dynamicTest(e.getKey(), () -> {
                Path plan = dir.resolve(e.getKey());
                String[] r = run(dir, "check", plan.toString());
                String expectedMessage = e.getValue()[1].replaceFirst(Pattern.quote(e.getKey()),
                        Matcher.quoteReplacement(plan.toString()));
                assertEquals(e.getValue()[0], r[0], "exit code");
                assertEquals(expectedMessage + System.lineSeparator(), r[2], "stderr");
            }));
        }
        return tests;
    }

    @TestFactory
    List<DynamicTest> everyMessageHasTheRequiredShape() throws IOException {
        List<DynamicTest> tests = new ArrayList<>();
        for (Map.Entry<String, String[]> e : expected().entrySet()) {
            tests.add(DynamicTest.dynamicTest(e.getKey(), () -> {
                String m = e.getValue()[1].replace(corpus().toString(), "DIR");
                assertEquals("2", e.getValue()[0], "bad input exits with 2");
                Matcher shape = SHAPE.matcher(m);
                assertTrue(shape.matches(), "file[:line:column]: [key: ]detail — " + m);
                assertEquals(e.getKey(), shape.group(1), "names the file");
                assertTrue(shape.group(2) != null || shape.group(4) != null, "a line and column, or a key: " + m);
                assertTrue(ACCEPTED.matcher(shape.group(5)).find(), "says what is accepted: " + m);
                assertFalse(m.contains("Exception"), m);
                assertFalse(m.contains("\tat ") || m.contains("\n"), "one line, no stack trace: " + m);
            }));
        }
        return tests;
    }

    @TestFactory
    List<DynamicTest> theParserGivesTheSameMessageWithPositionFields() throws IOException {
        // the library-level exception carries the same position the message shows
        Path dir = corpus();
        List<DynamicTest> tests = new ArrayList<>();
        for (Map.Entry<String, String[]> e : expected().entrySet()) {
            tests.add(DynamicTest.dynamicTest(e.getKey(), () -> {
                Path plan = dir.resolve(e.getKey());
                try {
                    PlanParser.parse(plan);
                } catch (BadInputException p) {
                    String expectedMessage = e.getValue()[1].replaceFirst(Pattern.quote(e.getKey()),
                            Matcher.quoteReplacement(plan.toString()));
                    assertEquals(expectedMessage, p.getMessage());
                    Matcher shape = SHAPE.matcher(e.getValue()[1].replace(dir.toString(), "DIR"));
                    assertTrue(shape.matches());
                    assertEquals(shape.group(2) == null ? 0 : Integer.parseInt(shape.group(2)), p.line());
                    assertEquals(shape.group(3) == null ? 0 : Integer.parseInt(shape.group(3)), p.column());
                    assertEquals(plan.toString(), p.file());
                    return;
                }
                // the plan parses: its problem is found when the data are loaded or the rates listed
                assertTrue(List.of("csv-missing-file.yaml", "data-label-for-synthetic.yaml",
                        "warmup-longer-than-run.yaml", "table-gaps-refused.yaml", "table-features-unknown-column.yaml",
                        "table-regression-label.yaml").contains(e.getKey()), e.getKey() + " parsed");
            }));
        }
        return tests;
    }
}
