package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.InputStream;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.function.UnaryOperator;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.format.EncodingJson;
import settle.reports.format.EncodingRecord;
import settle.reports.format.Study;
import settle.reports.format.StudyReader;

/**
 * A study on a CSV table with text columns, a numeric-coded column made categorical and gaps, end to end: the run,
 * a resume with a changed table key, a damaged {@code encoding.json}, the report's class-balance and coefficients
 * sections, and {@code settle minimum --plan}. The table is the bundled Congressional votes (housevotes84.csv, y/n
 * answers with gaps) cut to every democrat and the first 36 republicans, so that the test split holds fewer than 10
 * republicans, with the 'crime' answers written as the codes 1/0 (its gaps kept), so that data.categorical has a
 * numeric column to act on. Nothing in it is invented.
 */
class TableEndToEndTest {

    @TempDir
    static Path dir;

    private static Path plan;
    private static Path study;
    private static String runOut;
    private static String runErr;
    private static byte[] encoding;

    private static final String PLAN = String.join("\n",
            "study: votes",
            "seed: 3",
            "replicates: 3",
            "data:",
            "  source: csv:votes.csv",
            "  test-fraction: 0.2",
            "  standardize: true",
            "  missing: impute",
            "  categorical: [crime]",
            "  drop: [water-project-cost-sharing]",
            "model: {kind: logistic, l2: 0.01}",
            "training: {epochs: 4, batch: 16}",
            "baseline: constant",
            "arms:",
            "  - name: constant",
            "    schedule: {kind: constant, rate: 0.2}",
            "  - name: cosine",
            "    schedule: {kind: cosine, rate: 0.2, floor: 0.0}",
            "");

    /** Every democrat and the first 36 republicans of the bundled table; 'crime' as 1 (y) / 0 (n), gaps kept. */
    static String votesTable() throws Exception {
        String text;
        try (InputStream in = TableEndToEndTest.class.getResourceAsStream(
                "/settle/datasets/bundled/housevotes84.csv")) {
            assertNotNull(in, "the bundled housevotes84.csv");
            text = new String(in.readAllBytes(), StandardCharsets.UTF_8);
        }
        List<String> lines = text.lines().toList();
        int crime = Arrays.asList(lines.get(0).split(",", -1)).indexOf("crime");
        assertTrue(crime >= 0, lines.get(0));
        StringBuilder out = new StringBuilder(lines.get(0)).append('\n');
        int republicans = 0;
        for (String line : lines.subList(1, lines.size())) {
            String[] cells = line.split(",", -1);
            if (cells[cells.length - 1].equals("republican") && ++republicans > 36) {
                continue;
            }
            cells[crime] = switch (cells[crime]) {
                case "y" -> "1";
                case "n" -> "0";
                case "" -> "";
                default -> throw new AssertionError("crime: " + cells[crime]);
            };
            out.append(String.join(",", cells)).append('\n');
        }
        return out.toString();
    }

    @BeforeAll
    static void aStudyOnTheTable() throws Exception {
        Files.writeString(dir.resolve("votes.csv"), votesTable());
        plan = dir.resolve("plan.yaml");
        Files.writeString(plan, PLAN);
        study = dir.resolve("study");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(out, err, "run", plan.toString(), "--out", study.toString(),
                "--quiet"), err.toString());
        runOut = out.toString();
        runErr = err.toString();
        encoding = Files.readAllBytes(study.resolve("encoding.json"));
    }

    /** @return every file under {@code root} by relative path, with its bytes */
    private static Map<String, byte[]> files(Path root) throws Exception {
        Map<String, byte[]> out = new TreeMap<>();
        try (var walk = Files.walk(root)) {
            for (Path p : walk.filter(Files::isRegularFile).toList()) {
                out.put(root.relativize(p).toString(), Files.readAllBytes(p));
            }
        }
        return out;
    }

    private static void assertSameFiles(Map<String, byte[]> before, Path root) throws Exception {
        Map<String, byte[]> after = files(root);
        assertEquals(before.keySet(), after.keySet(), "the same files");
        for (Map.Entry<String, byte[]> e : before.entrySet()) {
            assertArrayEquals(e.getValue(), after.get(e.getKey()), e.getKey() + " unchanged");
        }
    }

    private record Change(String name, String from, String to, String expected) {
    }

    @TestFactory
    List<DynamicTest> aResumeWithAChangedTableKeyIsRefusedByNameAndKeepsTheStudy() throws Exception {
        String refusal = "; this study was run with the encoding it records in encoding.json: use --fresh to discard"
                + " its results, or --out DIR for a new study";
        List<Change> changes = List.of(
                new Change("data.categorical", "  categorical: [crime]\n", "",
                        "data.categorical: column 'crime' is now a number (was categorical)"),
                new Change("data.missing", "missing: impute", "missing: drop-rows",
                        "data.missing: now drop-rows (was impute)"),
                new Change("data.drop", "drop: [water-project-cost-sharing]",
                        "drop: [water-project-cost-sharing, immigration]",
                        "data.drop: column 'immigration' is now dropped (was a feature)"));
        List<DynamicTest> tests = new ArrayList<>();
        for (Change c : changes) {
            tests.add(DynamicTest.dynamicTest(c.name(), () -> {
                Map<String, byte[]> before = files(study);
                assertTrue(PLAN.contains(c.from()), c.from());
                Path changed = dir.resolve("changed-" + c.name() + ".yaml");
                Files.writeString(changed, PLAN.replace(c.from(), c.to()));
                StringWriter err = new StringWriter();
                assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "run", changed.toString(), "--out",
                        study.toString(), "--quiet"), err.toString());
                List<String> lines = err.toString().strip().lines().filter(l -> !l.startsWith("warning: ")).toList();
                assertEquals(List.of(study + ": " + c.expected() + refusal), lines);
                assertSameFiles(before, study);
            }));
        }
        return tests;
    }

    @Test
    void encodingJsonRecordsTheTableAndReadsBackToTheSameBytes() throws Exception {
        Study read = StudyReader.read(study);
        EncodingRecord e = read.encoding();
        assertNotNull(e);
        assertArrayEquals(encoding, EncodingJson.write(e), "written, read and written again: the same bytes");
        assertArrayEquals(encoding, EncodingJson.write(EncodingJson.read(encoding, "encoding.json")),
                "read on its own, as a resumed run reads it");
        assertEquals(read.manifest().featureNames(), e.outputs());
        assertEquals(read.manifest().testRows(), e.testLabels().length);
        assertEquals("impute", e.missing());
        EncodingRecord.Input dropped = e.inputs().stream().filter(c -> c.name().equals("water-project-cost-sharing"))
                .findFirst().orElseThrow();
        assertEquals("dropped", dropped.role());
        EncodingRecord.Feature crime = e.features().stream().filter(f -> f.name().equals("crime")).findFirst()
                .orElseThrow();
        assertEquals(EncodingRecord.CATEGORY, crime.encoding());
        assertEquals(List.of("0", "1"), crime.levels());
        assertEquals(List.of("crime=0", "crime=1", "crime=(missing)"), crime.outputs());
        EncodingRecord.Input crimeInput = e.inputs().stream().filter(c -> c.name().equals("crime")).findFirst()
                .orElseThrow();
        assertEquals(EncodingRecord.NUMBER, crimeInput.type(), "read as numbers, made categorical by the key");
        assertEquals(7, e.split("test").classCounts()[1], "republicans in the test split");
    }

    private record Damage(String name, UnaryOperator<String> damage, String reportSays, String runSays) {
    }

    @TestFactory
    List<DynamicTest> aDamagedEncodingJsonIsNamedByFieldForReportAndRun() throws Exception {
        String text = new String(encoding, StandardCharsets.UTF_8);
        // the features in order: the 15 vote columns left after data.drop; 'crime' is the 13th (index 12), its
        // outputs features 37 to 39 of the manifest
        List<Damage> damages = List.of(
                new Damage("truncated", s -> s.substring(0, s.length() / 2),
                        ":NUMBERS: not valid JSON: the file ends in the middle of a value (it was cut short)", null),
                new Damage("a wrong type", s -> s.replaceFirst("\"median\" : null", "\"median\" : \"x\""),
                        ": features[0].median: must be a number or null, not the text 'x'", null),
                new Damage("a test label out of range", s -> s.replaceFirst("\"test_labels\" : \\[ 1,",
                        "\"test_labels\" : [ 5,"), ": test_labels[0]: must be a whole number in [0, 1], not 5", null),
                new Damage("an output renamed", s -> s.replace("\"crime=1\"", "\"crime=yes\""),
                        ": features[12].outputs: output 'crime=yes' is not feature 38 of the manifest ('crime=1');"
                                + " the outputs in order are the manifest's feature names",
                        ": features[12].outputs: does not match the encoding of the plan and the"
                                + " data, which are unchanged since the study was run (column 'crime' now gives the"
                                + " inputs 'crime=0', 'crime=1', 'crime=(missing)' (was 'crime=0', 'crime=yes',"
                                + " 'crime=(missing)')): the file was edited or damaged"));
        List<DynamicTest> tests = new ArrayList<>();
        int i = 0;
        for (Damage d : damages) {
            Path copy = dir.resolve("damaged-" + i++);
            tests.add(DynamicTest.dynamicTest(d.name(), () -> {
                StudyFiles.copyTree(study, copy);
                Path file = copy.resolve("encoding.json");
                String damaged = d.damage().apply(text);
                assertFalse(damaged.equals(text), "the damage changes the file");
                Files.writeString(file, damaged);
                Map<String, byte[]> before = files(copy);
                String remedy = "; it is made from the plan and the data: delete it, and settle run "
                        + copy.resolve("plan.yaml") + " --out " + copy + " writes it again, keeping the finished"
                        + " replicates";

                StringWriter err = new StringWriter();
                assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "report", copy.toString()));
                assertOneLine(file + d.reportSays() + remedy, err.toString());
                assertSameFiles(before, copy);

                err = new StringWriter();
                assertEquals(2, StudyRunnerTest.settle(new StringWriter(), err, "run", plan.toString(), "--out",
                        copy.toString(), "--quiet"));
                assertOneLine(file + (d.runSays() == null ? d.reportSays() : d.runSays()) + remedy, err.toString());
                assertSameFiles(before, copy);

                // as the line says: without the file, the run trains nothing, keeps every replicate and writes the
                // file again as it was
                Files.delete(file);
                StringWriter out = new StringWriter();
                err = new StringWriter();
                assertEquals(0, StudyRunnerTest.settle(out, err, "run", plan.toString(), "--out", copy.toString(),
                        "--quiet", "--json"), err.toString());
                assertEquals(0, new ObjectMapper().readTree(out.toString()).path("trained_now").asInt(-1));
                assertArrayEquals(encoding, Files.readAllBytes(file));
                for (Map.Entry<String, byte[]> e : before.entrySet()) {
                    if (e.getKey().startsWith("arms")) {
                        assertArrayEquals(e.getValue(), Files.readAllBytes(copy.resolve(e.getKey())), e.getKey());
                    }
                }
            }));
        }
        return tests;
    }

    /** NUMBERS in the expected line stands for a line and column. */
    private static void assertOneLine(String expected, String stderr) {
        String line = stderr.strip();
        assertEquals(-1, line.indexOf('\n'), "one line: " + line);
        String regex = Pattern.quote(expected).replace("NUMBERS", "\\E[0-9]+:[0-9]+\\Q");
        assertTrue(line.matches(regex), "expected " + expected + "\nsaid     " + line);
    }

    @Test
    void theReportShowsClassBalanceAndNamedCoefficientsWithTheFewRowsWarning() throws Exception {
        String html = Files.readString(study.resolve("report.html"));
        String classes = section(html, "classes");
        String caution = "per-class figures rest on 7 test rows of class 'republican' (fewer than 10; its recall"
                + " moves in steps of 14.3 pp)";
        assertTrue(classes.contains(caution.replace("'", "&#39;")), classes);
        assertTrue(classes.contains("balanced accuracy"), classes);
        assertTrue(classes.contains("republican (7 test rows)"), classes);
        assertTrue(classes.contains("democrat (53 test rows)"), classes);
        // the same caution on the terminal after the verdict, and in --json
        assertTrue((runOut + runErr).contains("warning: " + caution), runOut + runErr);
        StringWriter out = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(out, new StringWriter(), "run", plan.toString(), "--out",
                study.toString(), "--quiet", "--json"));
        assertEquals(caution, new ObjectMapper().readTree(out.toString()).path("class_caution").asText());

        String coefficients = section(html, "coefficients");
        JsonNode manifest = new ObjectMapper().readTree(study.resolve("manifest.json").toFile());
        List<String> names = new ArrayList<>();
        manifest.path("data").path("feature_names").forEach(n -> names.add(n.asText()));
        Matcher row = Pattern.compile("<th scope=\"row\">([^<]*)</th>").matcher(coefficients);
        List<String> shown = new ArrayList<>();
        while (row.find()) {
            shown.add(row.group(1));
        }
        assertEquals(11, shown.size(), "the 10 largest weights and the bias: " + shown);
        assertEquals("(bias)", shown.get(10));
        for (String name : shown.subList(0, 10)) {
            assertTrue(names.contains(name), name + " is an input's name");
            assertTrue(name.contains("="), name + ": a vote column's level, column=level");
        }
    }

    private static String section(String html, String id) {
        Matcher m = Pattern.compile("<section id=\"" + id + "\">.*?</section>", Pattern.DOTALL).matcher(html);
        assertTrue(m.find(), "section " + id);
        return m.group();
    }

    @Test
    void checkForetellsTheFewTestRowsBeforeAnythingIsTrained() {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(out, err, "check", plan.toString()), err.toString());
        assertTrue(out.toString().contains("  classes: democrat 267 (training 214, test 53); republican 36 (training"
                + " 29, test 7)\n"), out.toString());
        assertTrue(err.toString().contains("warning: " + plan + ":6:18: data.test-fraction: the report's per-class"
                + " figures will rest on 7 test rows of class 'republican' (fewer than 10; its recall moves in steps of"
                + " 14.3 pp); a larger data.test-fraction gives it more\n"), err.toString());
    }

    @Test
    void minimumOnThePlanPrintsTheStudysThetaByInputName() throws Exception {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(out, err, "minimum", "--plan", plan.toString()), err.toString());
        String text = out.toString();
        assertTrue(text.contains("  w[crime=0]\n") && text.contains("  w[crime=(missing)]\n")
                && text.contains("  w[physician-fee-freeze=y]\n") && text.contains("  bias\n"), text);
        assertFalse(text.contains("water-project-cost-sharing"), "a dropped column gives no input");

        Path theta = dir.resolve("theta.txt");
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), new StringWriter(), "minimum", "--plan",
                plan.toString(), "--out", theta.toString()));
        List<Double> values = Files.readAllLines(theta).stream().map(Double::parseDouble).toList();
        List<Double> recorded = new ArrayList<>();
        new ObjectMapper().readTree(study.resolve("reference.json").toFile()).path("theta")
                .forEach(v -> recorded.add(v.asDouble()));
        assertEquals(recorded, values, "the θ* the study's reference.json records, bit for bit");
    }
}
