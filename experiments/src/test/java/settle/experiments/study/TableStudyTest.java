package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.random.RandomGenerator;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.datasets.Randomness;
import settle.datasets.io.CsvReader;
import settle.experiments.cli.Main;

/** Studies on CSV tables: a numeric table keeps today's data hash; a table with text and gaps trains with one key. */
class TableStudyTest {

    @TempDir
    Path dir;

    static int settle(StringWriter out, StringWriter err, String... args) {
        return Main.run(new PrintWriter(out), new PrintWriter(err), args);
    }

    static String plan(String source, String extra) {
        return String.join("\n",
                "study: table",
                "seed: 5",
                "replicates: 2",
                "data:",
                "  source: " + source,
                extra,
                "model: {kind: logistic, l2: 0.01}",
                "training: {epochs: 3, batch: 16, snapshots: 4}",
                "arms:",
                "  - name: constant",
                "    schedule: {kind: constant, rate: 0.2}",
                "  - name: decay",
                "    schedule: {kind: reciprocal, rate: 0.2, decay: 1.0, per: epoch}",
                "");
    }

    @Test
    void aNumericTableKeepsTheDataHashOfTheNumericReader() throws Exception {
        RandomGenerator random = Randomness.create(3);
        StringBuilder csv = new StringBuilder("a,b,c,y\n");
        for (int r = 0; r < 120; r++) {
            csv.append(String.format(Locale.ROOT, "%.5f,%d,\"%.3e\",%s%n", random.nextGaussian(), random.nextInt(9),
                    random.nextGaussian(), r % 3 == 0 ? "yes" : "no"));
        }
        Path data = dir.resolve("numbers.csv");
        Files.writeString(data, csv.toString());
        Path planFile = dir.resolve("plan.yaml");
        Files.writeString(planFile, plan("csv:numbers.csv", ""));
        Path out = dir.resolve("study");
        StringWriter err = new StringWriter();
        assertEquals(0, settle(new StringWriter(), err, "run", planFile.toString(), "--out", out.toString(), "--quiet"),
                err.toString());
        JsonNode manifest = new ObjectMapper().readTree(out.resolve("manifest.json").toFile());
        String shownAs = data.toAbsolutePath().normalize().toString();
        assertEquals(Hashes.of(CsvReader.read(data, shownAs, null, CsvReader.DETECT)),
                manifest.path("data_sha256").asText());
    }

    @Test
    void aTableWithTextAndGapsIsRefusedWithCountsThenTrainsWithOneKey() throws Exception {
        RandomGenerator random = Randomness.create(4);
        StringBuilder csv = new StringBuilder("id,colour,size,answer,y\n");
        String[] colours = {"red", "green", "blue"};
        for (int r = 0; r < 150; r++) {
            int k = random.nextInt(3);
            String colour = r % 17 == 5 ? "" : colours[k];
            String size = r % 13 == 2 ? "NA" : String.format(Locale.ROOT, "%.2f", k + random.nextGaussian());
            csv.append(1000 + r).append(',').append(colour).append(',').append(size).append(',')
                    .append(random.nextBoolean() ? "y" : "n").append(',').append(k == 0 ? "warm" : "cold").append('\n');
        }
        Files.writeString(dir.resolve("survey.csv"), csv.toString());
        Path refused = dir.resolve("refused.yaml");
        Files.writeString(refused, plan("csv:survey.csv", ""));
        StringWriter err = new StringWriter();
        assertEquals(2, settle(new StringWriter(), err, "check", refused.toString()));
        // gaps: colour on rows 5, 22, …, 141 (9 rows); size on rows 2, 15, …, 145 (12 rows); none in both
        assertTrue(err.toString().startsWith(refused + ":4:1: data.missing: " + dir.resolve("survey.csv")
                + ": missing cells (empty, NA, N/A, NaN, null, none or ?) in 21 of 150 rows: 'colour' 9 (first on line"
                + " 7), 'size' 12 (first on line 4); expected none under data.missing: refuse (the default), or"
                + " data.missing: drop-rows"), err.toString());

        Path planFile = dir.resolve("plan.yaml");
        Files.writeString(planFile, plan("csv:survey.csv", "  missing: impute\n  drop: [id]"));
        Path out = dir.resolve("study");
        err = new StringWriter();
        StringWriter stdout = new StringWriter();
        assertEquals(0, settle(stdout, err, "run", planFile.toString(), "--out", out.toString(), "--quiet"),
                err.toString());
        String resolved = Files.readString(out.resolve("plan.yaml"));
        assertTrue(resolved.contains("  drop: [id]\n  missing: impute\n"), resolved);
        JsonNode manifest = new ObjectMapper().readTree(out.resolve("manifest.json").toFile());
        // colour: 3 levels (+ a level for its gaps when training has some), size + was-missing, answer: n, y
        JsonNode names = manifest.path("data").path("feature_names");
        assertTrue(names.toString().contains("\"colour=blue\",\"colour=green\",\"colour=red\""), names.toString());
        assertTrue(names.toString().contains("\"size\",\"size (was missing)\",\"answer=n\",\"answer=y\""),
                names.toString());
        // the same plan again resumes the same study: the resolved plan with its table keys reads back equal
        err = new StringWriter();
        assertEquals(0, settle(new StringWriter(), err, "run", planFile.toString(), "--out", out.toString(), "--quiet"),
                err.toString());
    }
}
