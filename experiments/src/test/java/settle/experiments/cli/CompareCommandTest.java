package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.format.StudyFormat;

/**
 * {@code settle compare} as a user runs it on two real (small) studies: the answer on the terminal, the page and the
 * CSV where the options say (beside the page when only --html is given), exit 0; and every bad input refused with one
 * line naming it, exit 2, nothing written: fewer than two studies, the same study twice (the same directory, or a copy),
 * a directory that is not a study, one in another format, a page that is a directory.
 */
class CompareCommandTest {

    @TempDir
    static Path dir;

    static Path first;
    static Path second;

    private static String plan(String study, int seed, String extra) {
        return String.join("\n",
                "study: " + study,
                "seed: " + seed,
                "replicates: 3",
                "data:",
                "  source: synthetic:gaussian?rows=120&features=2&classes=2&separation=1.5&seed=3",
                "  test-fraction: 0.25",
                "  standardize: true",
                "model:",
                "  kind: logistic",
                "  l2: 0.01",
                "training:",
                "  epochs: 3",
                "  batch: 8",
                "baseline: constant",
                "arms:",
                "  - name: constant",
                "    schedule: {kind: constant, rate: 0.3}",
                "  - name: cosine",
                "    schedule: {kind: cosine, rate: 0.3, floor: 0.0}",
                extra,
                "");
    }

    @BeforeAll
    static void twoStudies() throws Exception {
        Path p1 = dir.resolve("one.yaml");
        Path p2 = dir.resolve("two.yaml");
        Files.writeString(p1, plan("first", 7, ""));
        Files.writeString(p2, plan("second", 8, "  - name: halving\n    schedule: {kind: stepped, rate: 0.3, cut: 0.5,"
                + " every: 1}"));
        first = dir.resolve("studies/first");
        second = dir.resolve("studies/second");
        assertEquals(0, Cli.run("run", p1.toString(), "--out", first.toString(), "--quiet").code());
        assertEquals(0, Cli.run("run", p2.toString(), "--out", second.toString(), "--quiet").code());
    }

    @Test
    void twoStudiesGiveTheAnswerThePageAndTheTable() throws Exception {
        Path page = dir.resolve("out/both.html");
        Cli.Result r = Cli.run("compare", first.toString(), second.toString(), "--html", page.toString());
        assertEquals(0, r.code(), r.err());
        assertEquals("", r.err());
        List<String> lines = r.out().lines().toList();
        assertTrue(lines.get(0).startsWith("2 studies (final gap of the returned iterate against the baseline constant;"),
                r.out());
        assertTrue(lines.get(1).startsWith("  cosine ends "), r.out());
        assertTrue(lines.get(1).contains(" than constant in "), r.out());
        assertTrue(lines.stream().anyMatch(l -> l.startsWith("  picks: first: ")), r.out());
        Path table = dir.resolve("out/both.csv");
        assertTrue(lines.contains("page: " + page.toAbsolutePath().normalize()), r.out());
        assertTrue(lines.contains("table: " + table.toAbsolutePath().normalize()), r.out());
        assertTrue(Files.readString(page, StandardCharsets.UTF_8).contains("<section id=\"forest\">"));
        List<String> csv = Files.readAllLines(table, StandardCharsets.UTF_8);
        assertEquals(1 + 1 + 2, csv.size(), "a header, cosine of the first, cosine and halving of the second");
        assertTrue(csv.get(0).startsWith("study,directory,group,"), csv.get(0));
        assertTrue(csv.get(1).startsWith("first,"), csv.get(1));
        // epochs, batch, sampling and updates as the plan asks and the run's manifest records them: 90 training rows
        // in batches of 8 are 12 updates an epoch, 36 in 3 epochs (sampling left out: the default, shuffle)
        assertTrue(csv.get(1).contains(",3,8,shuffle,36,3,3,constant,final_gap,cosine,true,"), csv.get(1));
        JsonNode training = new ObjectMapper().readTree(first.resolve("manifest.json").toFile()).path("training");
        assertEquals(3, training.path("epochs").asInt());
        assertEquals(8, training.path("batch").asInt());
        assertEquals("shuffle", training.path("sampling").asText());
        assertEquals(12, new ObjectMapper().readTree(first.resolve("manifest.json").toFile()).path("data")
                .path("updates_per_epoch").asInt());
    }

    @Test
    void theTableGoesWhereAsked() throws Exception {
        Path page = dir.resolve("where/page.html");
        Path table = dir.resolve("where/elsewhere/t.csv");
        Cli.Result r = Cli.run("compare", first.toString(), second.toString(), "--html", page.toString(), "--csv",
                table.toString());
        assertEquals(0, r.code(), r.err());
        assertTrue(Files.isRegularFile(page));
        assertTrue(Files.isRegularFile(table));
        assertFalse(Files.exists(dir.resolve("where/page.csv")));
    }

    /** Runs a refused compare: exit 2, one line on stderr starting with {@code start}, nothing written. */
    private static void refused(String start, String... studies) throws Exception {
        Path page = dir.resolve("refused/page.html");
        String[] args = new String[studies.length + 3];
        args[0] = "compare";
        System.arraycopy(studies, 0, args, 1, studies.length);
        args[studies.length + 1] = "--html";
        args[studies.length + 2] = page.toString();
        Cli.Result r = Cli.run(args);
        assertEquals(2, r.code(), r.out() + r.err());
        assertEquals(1, r.err().lines().count(), "one line: " + r.err());
        assertTrue(r.err().startsWith(start), r.err());
        assertFalse(r.err().contains("Exception") || r.err().contains("\tat "), r.err());
        assertEquals("", r.out());
        assertFalse(Files.exists(page), "nothing written");
        assertFalse(Files.exists(dir.resolve("refused/page.csv")), "nothing written");
    }

    @Test
    void badInputIsOneLineAndExitTwo() throws Exception {
        refused("settle compare: only one study directory given ('" + first + "'); compare needs two or more",
                first.toString());
        refused("settle compare: no study directory given; compare needs two or more");
        refused(first + "/.: given twice (also as " + first + "); give each study once", first.toString(),
                second.toString(), first + "/.");
        Path copy = dir.resolve("copy");
        try (var files = Files.walk(first)) {
            for (Path f : files.toList()) {
                Files.copy(f, copy.resolve(first.relativize(f).toString()));
            }
        }
        refused(copy + ": the same study as " + first, first.toString(), copy.toString());
        refused(dir.resolve("nowhere") + ": no such study directory", first.toString(),
                dir.resolve("nowhere").toString());
        refused(dir + ": not a study directory", dir.toString(), first.toString());
        Path plan = dir.resolve("one.yaml");
        refused(plan + ": a file, not a study directory", first.toString(), plan.toString());

        Path old = dir.resolve("old");
        try (var files = Files.walk(second)) {
            for (Path f : files.toList()) {
                Files.copy(f, old.resolve(second.relativize(f).toString()));
            }
        }
        Path manifest = old.resolve("manifest.json");
        String text = Files.readString(manifest, StandardCharsets.UTF_8);
        Files.writeString(manifest, text.replaceFirst("\"format\" ?: ?\\d+", "\"format\": 1"), StandardCharsets.UTF_8);
        refused(manifest + ": this study directory is in format 1", first.toString(), old.toString());
    }

    @Test
    void aPartialStudyIsComparedAsItStandsWithExitThree() throws Exception {
        Path partial = dir.resolve("partial");
        try (var files = Files.walk(second)) {
            for (Path f : files.toList()) {
                Files.copy(f, partial.resolve(second.relativize(f).toString()));
            }
        }
        String arm = settle.reports.format.StudyReader.read(partial).manifest().armIds().get(1);
        Files.delete(StudyFormat.replicateFile(partial, arm, 3));
        Files.deleteIfExists(StudyFormat.binaryFile(partial, arm, 3));
        Path page = dir.resolve("partial.html");
        Cli.Result r = Cli.run("compare", first.toString(), partial.toString(), "--html", page.toString());
        assertEquals(3, r.code(), r.err());
        assertEquals("settle compare: " + partial + ": partial study: 1 of 9 replicates missing (its verdict pairs the 2"
                + " indices present in every arm)" + System.lineSeparator(), r.err());
        assertTrue(Files.readString(page, StandardCharsets.UTF_8).contains("is partial (1 replicate missing"));
    }

    @Test
    void aPageThatIsADirectoryIsRefused() throws Exception {
        Files.createDirectories(dir.resolve("adir"));
        Cli.Result r = Cli.run("compare", first.toString(), second.toString(), "--html", dir.resolve("adir").toString());
        assertEquals(2, r.code());
        assertEquals("settle compare: --html '" + dir.resolve("adir") + "' is a directory; expected the file to write"
                + System.lineSeparator(), r.err());
    }
}
