package settle.datasets;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.stream.Stream;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;
import settle.input.BadInputException;

/** Every file under malformed/ must fail with exactly the one-line message that expected.tsv gives it. */
class MalformedCorpusTest {

    private static final Path DIR = Path.of("src", "test", "resources", "malformed");
    private static final int MINIMUM_CORPUS = 25;

    private static List<String[]> manifest() throws Exception {
        List<String[]> rows = new ArrayList<>();
        for (String line : Files.readAllLines(DIR.resolve("expected.tsv"), StandardCharsets.UTF_8)) {
            if (!line.isEmpty() && !line.startsWith("#")) {
                String[] f = line.split("\t", 3);
                assertEquals(3, f.length, line);
                rows.add(f);
            }
        }
        return rows;
    }

    @Test
    void everyFileHasAnExpectationAndTheCorpusIsLargeEnough() throws Exception {
        Set<String> files = new TreeSet<>();
        try (Stream<Path> s = Files.list(DIR)) {
            s.map(p -> p.getFileName().toString()).filter(n -> !n.equals("expected.tsv")).forEach(files::add);
        }
        Set<String> listed = new TreeSet<>();
        for (String[] row : manifest()) {
            listed.add(row[0]);
        }
        assertEquals(files, listed);
        assertTrue(listed.size() >= MINIMUM_CORPUS, "corpus of " + listed.size());
        assertTrue(listed.stream().filter(n -> n.endsWith(".csv")).count() >= 10);
        assertTrue(listed.stream().filter(n -> n.endsWith(".txt")).count() >= 10);
    }

    @TestFactory
    List<DynamicTest> eachFileGivesItsMessage() throws Exception {
        List<DynamicTest> tests = new ArrayList<>();
        for (String[] row : manifest()) {
            String file = row[0];
            String label = row[1].equals("-") ? null : row[1];
            String expected = row[2];
            String source = (file.endsWith(".csv") ? "csv:" : "libsvm:") + file;
            tests.add(DynamicTest.dynamicTest(file, () -> {
                BadInputException e = assertThrows(BadInputException.class, () -> DataSources.load(source, label, DIR));
                assertEquals(expected, e.getMessage());
                assertFalse(e.getMessage().contains("\n"), "one line");
                assertTrue(e.getMessage().startsWith(file + ": "), "names the file");
            }));
        }
        return tests;
    }
}
