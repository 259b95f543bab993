package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.compare.StudyDigest;
import settle.reports.format.Grid;
import settle.reports.format.Manifest;
import settle.input.BadInputException;
import settle.reports.format.StudyReader;
import settle.reports.metrics.StudyAnalysis;

/**
 * What the report learns from the manifest and nowhere else: the study's name, the model's λ, the training settings
 * (the comparison's budget) and the grid structure. A manifest without them is refused with one line naming the file and key; a malformed grid likewise. Arm
 * names that look like grid arms make no grid, and a grid needs no such names.
 */
class ManifestRecordsTest {

    private static final ObjectMapper MAPPER = new ObjectMapper();

    @TempDir
    Path dir;

    /** Arms: constant, then four arms named as the test says; every arm 3 replicates. */
    private static SyntheticStudy study(String... names) {
        SyntheticStudy s = new SyntheticStudy();
        s.tailRadius(s.arm("constant", false, 3), 1.0, 1.1, 1.2);
        double scale = 0.9;
        for (String name : names) {
            s.tailRadius(s.arm(name, false, 3), scale, scale + 0.1, scale + 0.2);
            scale -= 0.1;
        }
        return s;
    }

    private static String section(String html, String id) {
        int from = html.indexOf("<section id=\"" + id + "\">");
        return html.substring(from, html.indexOf("</section>", from));
    }

    @Test
    void readsTheNameTheLambdaAndTheGrid() throws Exception {
        SyntheticStudy s = study("slow", "slower", "fast", "faster");
        s.study = "from-the-manifest";
        s.l2 = 0.0;
        s.planText = "study: not-this-name\nmodel:\n  l2: 0.5\ntraining:\n  epochs: 9\n  batch: 99\n  sampling:"
                + " replacement\n";
        s.batch = 20;
        s.momentum = 0.25;
        s.grid("reciprocal", 1, List.of("rate", "decay"), List.of(List.of("0.1", "0.2"), List.of("0.3", "1.0")));
        Manifest m = StudyReader.read(s.write(dir.resolve("s"))).manifest();
        assertEquals("from-the-manifest", m.study());
        assertEquals(0.0, m.l2());
        assertEquals(new Manifest.Training(4, 20, "shuffle", 0.25, 0.5, 2), m.training());
        // the comparison's budget is the manifest's, whatever the plan's text says
        StudyDigest digest = StudyDigest.of(StudyAnalysis.of(StudyReader.read(dir.resolve("s"))));
        assertEquals("4 epochs × 5 updates (batch 20, shuffle) = 20 updates", digest.budget());
        assertEquals(1, m.grids().size());
        Grid g = m.grids().get(0);
        assertEquals("reciprocal", g.arm());
        assertEquals(List.of("rate", "decay"), g.keys());
        assertEquals(List.of(List.of("0.1", "0.2"), List.of("0.3", "1.0")), g.values());
        // manifest indices 2–5 are arms 1–4 from 0; the last key varies fastest
        assertEquals(List.of(new Grid.Member(1, List.of("0.1", "0.3")), new Grid.Member(2, List.of("0.1", "1.0")),
                new Grid.Member(3, List.of("0.2", "0.3")), new Grid.Member(4, List.of("0.2", "1.0"))), g.members());

        Report.write(dir.resolve("s"));
        String html = Files.readString(dir.resolve("s/report.html"));
        assertTrue(html.contains("<title>settle report: from-the-manifest</title>"), "the name is the manifest's");
        assertFalse(html.contains("settle report: not-this-name"));
        // The grid comes from the manifest alone: its arms have plain names.
        String grid = section(html, "grid");
        assertTrue(grid.contains("<h3>Arm reciprocal over rate × decay</h3>"), grid);
        assertEquals(4, ReportHtmlTest.count(grid, "class=\"chart heatmap\""), "final gap (primary), tail radius, test "
                + "loss and test accuracy");
        assertEquals(4, ReportHtmlTest.count(ReportHtmlTest.svg(html, "heatmap-1"), "class=\"cell\""));
        assertTrue(grid.indexOf("median final gap") < grid.indexOf("median tail radius"), "the primary metric first");
        // Rows are the rate's values, columns the decay's, as written; the cell of rate 0.2, decay 1.0 is arm
        // "faster", whose median tail radius is 0.6 + 0.1 = 0.7.
        assertTrue(ReportHtmlTest.svg(html, "heatmap-2").contains("<title>rate 0.2, decay 1.0: 0.7</title>"));
    }

    @Test
    void armsNamedLikeGridArmsWithoutAGridGetNoHeatmap() throws Exception {
        Path study = study("foo[a=1,b=2]", "foo[a=2,b=2]", "foo[a=1,b=3]", "foo[a=2,b=3]").write(dir.resolve("foo"));
        Report.write(study);
        String grid = section(Files.readString(study.resolve("report.html")), "grid");
        assertFalse(grid.contains("heatmap"), grid);
        assertTrue(grid.contains("The plan has no grid"), grid);
    }

    @Test
    void aManifestWithoutWhatTheReportNeedsIsRefusedByKey() throws Exception {
        for (String key : List.of("study", "model_l2", "training", "grid")) {
            SyntheticStudy s = study("decay");
            s.omitted.add(key);
            Path study = s.write(dir.resolve("without-" + key));
            Path manifest = study.resolve("manifest.json");
            String message = assertThrows(BadInputException.class, () -> Report.write(study)).getMessage();
            assertEquals(manifest + ": " + key + ": missing (the manifest records the study's name, model_l2,"
                    + " training and grid for the report since this settle); run the study's plan again with settle run PLAN --out "
                    + study.toAbsolutePath() + " to rewrite it: its finished replicates are kept", message);
            assertFalse(Files.exists(study.resolve("report.html")));
        }
    }

    @Test
    void aMalformedGridOrLambdaIsRefusedWithItsKeyPath() throws Exception {
        assertRefused("model_l2", MAPPER.getNodeFactory().numberNode(-1.0), "model_l2: must be a number ≥ 0, not -1.0");
        assertRefused("study", MAPPER.getNodeFactory().textNode(" "), "study: is empty; expected the study's name");
        assertRefused("grid", grid(6, "0.1"), "grid[0].arms[1].index: must be a whole number in [1, 3], not 6");
        assertRefused("grid", grid(2, "0.1"), "grid[0].arms[1].index: 2 is already listed by a grid; an arm comes from"
                + " at most one grid entry");
        assertRefused("grid", grid(3, "0.5"), "grid[0].arms[1].values[0]: is '0.5', not one of the values of 'rate'");
        assertRefused("training", training("epochs", MAPPER.getNodeFactory().numberNode(0)),
                "training.epochs: must be a whole number in [1, 2147483647], not 0");
        assertRefused("training", training("batch", MAPPER.getNodeFactory().textNode("32")),
                "training.batch: must be a whole number in [1, 2147483647], not the text '32'");
        assertRefused("training", training("batch", MAPPER.getNodeFactory().numberNode(2.5)),
                "training.batch: must be a whole number in [1, 2147483647], not 2.5");
        assertRefused("training", training("sampling", MAPPER.getNodeFactory().textNode("Shuffle")),
                "training.sampling: must be one of shuffle, replacement, not the text 'Shuffle'");
        assertRefused("training", training("momentum", MAPPER.getNodeFactory().numberNode(1.0)),
                "training.momentum: must be a number in [0, 1), not 1.0");
        assertRefused("training", training("tail", MAPPER.getNodeFactory().numberNode(0.0)),
                "training.tail: must be a number in (0, 1], not 0.0");
        assertRefused("training", training("snapshots", MAPPER.getNodeFactory().nullNode()),
                "training.snapshots: must be a whole number in [1, 2147483647], not null");
        assertRefused("training", training("epochs", null), "training.epochs: missing; every 'training' has it");
        assertRefused("training", MAPPER.getNodeFactory().arrayNode(), "training: must be an object, not an array");
        ObjectNode noName = grid(3, "0.2");
        ((ObjectNode) noName.get("grid").get(0)).remove("arm");
        assertRefused("grid", noName, "grid[0].arm: missing; every 'grid[0]' has it");
    }

    /** @return a holder of a manifest "training" as SyntheticStudy writes it, with {@code value} at {@code key} (null: removed) */
    private static ObjectNode training(String key, JsonNode value) {
        ObjectNode holder = MAPPER.createObjectNode();
        ObjectNode t = holder.putObject("training");
        t.put("epochs", 4).put("batch", 16).put("sampling", "shuffle").put("momentum", 0.0).put("tail", 0.5)
                .put("snapshots", 2);
        if (value == null) {
            t.remove(key);
        } else {
            t.set(key, value);
        }
        return holder;
    }

    /** @return a manifest "grid" with one entry over rate [0.1, 0.2], arms 2 (0.1) and {@code second} (value) */
    private static ObjectNode grid(int second, String value) {
        ObjectNode holder = MAPPER.createObjectNode();
        ObjectNode g = holder.putArray("grid").addObject();
        g.put("arm", "decay");
        g.putArray("keys").addObject().put("name", "rate").putArray("values").add("0.1").add("0.2");
        g.putArray("arms").add(MAPPER.createObjectNode().put("index", 2).set("values",
                MAPPER.createArrayNode().add("0.1")));
        ((ArrayNode) g.get("arms")).add(MAPPER.createObjectNode().put("index", second).set("values",
                MAPPER.createArrayNode().add(value)));
        return holder;
    }

    /** Writes a study of 3 arms whose manifest has {@code value} at {@code key}, and expects the one-line refusal. */
    private void assertRefused(String key, Object value, String expected) throws Exception {
        Path study = study("decay", "decay-2").write(dir.resolve("bad-" + expected.hashCode()));
        Path manifest = study.resolve("manifest.json");
        ObjectNode m = (ObjectNode) MAPPER.readTree(manifest.toFile());
        if (value instanceof ObjectNode holder) {
            m.set(key, holder.get(key));
        } else {
            m.set(key, (JsonNode) value);
        }
        MAPPER.writeValue(manifest.toFile(), m);
        assertEquals(manifest + ": " + expected,
                assertThrows(BadInputException.class, () -> StudyReader.read(study)).getMessage());
    }
}
