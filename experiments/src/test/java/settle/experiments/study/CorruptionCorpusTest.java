package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.UnaryOperator;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.TestFactory;
import org.junit.jupiter.api.io.TempDir;

/**
 * The corruption corpus: one replicate file of a finished study damaged in each way a disk, a copy or a hand can
 * damage it. {@code settle report} refuses each with exit 2 and one line naming the file and the field (and what to
 * do); {@code settle run} on the same plan sets the file aside under a quarantine name (its bytes kept), names it on
 * stderr, trains the replicate again, and ends with exactly the file an uninterrupted run wrote. No damaged file
 * reaches the verdict.
 */
class CorruptionCorpusTest {

    @TempDir
    static Path dir;

    private static Path plan;
    private static Path original;

    /** The damaged file: replicate 2 of arm 3. */
    private static final String DAMAGED = "arms/3/2.json";

    @BeforeAll
    static void aFinishedStudy() throws Exception {
        plan = dir.resolve("plan.yaml");
        Files.writeString(plan, StudyRunnerTest.plan("corpus", 3, ""));
        original = dir.resolve("original");
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "run", plan.toString(), "--out",
                original.toString(), "--quiet", "--threads", "1"));
    }

    /**
     * One way to damage a file.
     *
     * @param name what the damage is
     * @param damage the damaged bytes from the whole file's
     * @param problem what the refusal says after the file's name (and before what to do)
     */
    private record Damage(String name, UnaryOperator<byte[]> damage, String problem) {
    }

    private static UnaryOperator<byte[]> text(UnaryOperator<String> edit) {
        return b -> edit.apply(new String(b, StandardCharsets.UTF_8)).getBytes(StandardCharsets.UTF_8);
    }

    private static List<Damage> corpus() throws Exception {
        byte[] other = Files.readAllBytes(original.resolve("arms/3/1.json"));
        return List.of(
                new Damage("truncated", b -> Arrays.copyOf(b, b.length / 2), ":NUMBERS: not valid JSON: the file ends in"
                        + " the middle of a value (it was cut short)"),
                new Damage("NUL bytes", b -> {
                    byte[] c = b.clone();
                    Arrays.fill(c, 200, 260, (byte) 0);
                    return c;
                }, ":NUMBERS: not valid JSON: it holds a control character (a NUL byte) where JSON allows none"),
                new Damage("empty", b -> new byte[0], ": the file is empty; expected a JSON object"),
                new Damage("another replicate's content", b -> other.clone(), ": replicate: the file holds arm 3"
                        + " replicate 1; its path says arm 3 replicate 2"),
                new Damage("a missing field", text(s -> s.replaceFirst("\"final_gap\" : [^,]*,\\s*", "")),
                        ": metrics.final_gap: missing; every 'metrics' has it"),
                new Damage("the metrics deleted", text(s -> s.replaceFirst("\"metrics\" : \\{[^}]*\\},\\s*", "")),
                        ": metrics: missing; every file of this kind has it"),
                new Damage("a wrong type", text(s -> s.replaceFirst("\"final_gap\" : [^,]*,", "\"final_gap\" : \"small\",")),
                        ": metrics.final_gap: must be a number, not the text 'small'"),
                new Damage("an out-of-range value", text(s -> s.replaceFirst("\"tail_radius\" : [^,]*,",
                        "\"tail_radius\" : -5.0,")), ": metrics.tail_radius: must be a number ≥ 0 or null, not -5.0"),
                new Damage("a probability row that does not sum to 1", text(s -> s.replaceFirst(
                        "(\"test_probabilities\" : \\{[^\\[]*\\[ )[^,]*,", "$10.75,")),
                        ": test_probabilities.values: row 1 sums to NUMBER; each row of class probabilities sums to 1"),
                new Damage("a vector of the wrong length", text(s -> s.replaceFirst("(\"last\" : \\[ )[^,]*, ", "$1")),
                        ": last: holds 3 values; expected 4"),
                new Damage("a wrong replicate index", text(s -> s.replaceFirst("\"replicate\" : 2,", "\"replicate\" : 9,")),
                        ": replicate: the file holds arm 3 replicate 9; its path says arm 3 replicate 2"),
                new Damage("a wrong format version", text(s -> s.replaceFirst("\"format\" : 2,", "\"format\" : 1,")),
                        ": format: this file is in format 1; this settle reads format 2"));
    }

    /** @return the problem as a pattern's text: NUMBERS stands for a line and column, NUMBER for a number */
    private static boolean matches(String expected, String actual) {
        String regex = java.util.regex.Pattern.quote(expected).replace("NUMBERS", "\\E[0-9]+:[0-9]+\\Q")
                .replace("NUMBER", "\\E[0-9.E-]+\\Q");
        return actual.matches(regex);
    }

    @TestFactory
    List<DynamicTest> reportRefusesByNameAndRunTrainsAgain() throws Exception {
        byte[] whole = Files.readAllBytes(original.resolve(DAMAGED));
        List<DynamicTest> tests = new ArrayList<>();
        int i = 0;
        for (Damage d : corpus()) {
            Path study = dir.resolve("case-" + i++);
            tests.add(DynamicTest.dynamicTest(d.name(), () -> {
                copy(original, study);
                Path file = study.resolve(DAMAGED);
                byte[] damaged = d.damage().apply(whole);
                assertFalse(Arrays.equals(whole, damaged), "the damage changes the file");
                Files.write(file, damaged);

                StringWriter err = new StringWriter();
                assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "report", study.toString()), d.name());
                String line = err.toString().strip();
                assertEquals(-1, line.indexOf('\n'), "one line: " + line);
                String remedy = "; settle run " + study.resolve("plan.yaml") + " --out " + study + " sets invalid"
                        + " replicate files aside and trains them again";
                assertTrue(line.startsWith(file.toString()) && line.endsWith(remedy), line);
                String problem = line.substring(file.toString().length(), line.length() - remedy.length());
                assertTrue(matches(d.problem(), problem), "expected " + d.problem() + ", said " + problem);

                err = new StringWriter();
                assertEquals(0, StudyRunnerTest.settle(new StringWriter(), err, "run", plan.toString(), "--out",
                        study.toString(), "--quiet"), err.toString());
                assertEquals("settle run: " + line.substring(0, line.length() - remedy.length()) + "; moved aside to"
                        + " 2.json.quarantined-1 and trained again", err.toString().strip());
                assertArrayEquals(whole, Files.readAllBytes(file), "trained again, byte for byte");
                assertArrayEquals(damaged, Files.readAllBytes(file.resolveSibling("2.json.quarantined-1")),
                        "the damaged file is kept aside, never deleted");
                assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "report",
                        study.toString()), "the report reads the study again");
            }));
        }
        return tests;
    }

    private static void copy(Path from, Path to) throws Exception {
        try (var walk = Files.walk(from)) {
            for (Path p : walk.toList()) {
                Path target = to.resolve(from.relativize(p).toString());
                if (Files.isDirectory(p)) {
                    Files.createDirectories(target);
                } else {
                    Files.copy(p, target);
                }
            }
        }
    }
}
