package settle.experiments.study;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The manifest records what the report needs (the study's name, the model's λ, the grid structure) and the report
 * draws the grid from there: the example grid plan gets its heatmaps, arms merely named like grid arms get none, and
 * running a study again from its own resolved plan.yaml (grid expanded) keeps the grid its first run recorded.
 */
class GridManifestTest {

    private static final ObjectMapper MAPPER = new ObjectMapper();

    @TempDir
    Path dir;

    private static String section(String html, String id) {
        int from = html.indexOf("<section id=\"" + id + "\">");
        return html.substring(from, html.indexOf("</section>", from));
    }

    /** Runs a plan into {@code out} quietly with the extra options given; asserts exit 0 (stderr in the message). */
    private static void run(Path plan, Path out, String... more) {
        List<String> args = new ArrayList<>(List.of("run", plan.toString(), "--out", out.toString(), "--quiet"));
        args.addAll(List.of(more));
        StringWriter err = new StringWriter();
        assertEquals(0, StudyRunnerTest.settle(new StringWriter(), err, args.toArray(new String[0])), err.toString());
    }

    @Test
    void theExampleGridPlanRecordsItsGridAndGetsItsHeatmaps() throws Exception {
        String text = Files.readString(Path.of("plans", "grid.yaml"));
        Path plan = dir.resolve("grid.yaml");
        Files.writeString(plan, text.replaceFirst("(?m)^replicates: \\d+$", "replicates: 2")
                .replaceFirst("(?m)^  epochs: \\d+$", "  epochs: 3"));
        Path study = dir.resolve("study");
        run(plan, study);
        StudySchema.validate(study);
        JsonNode m = MAPPER.readTree(study.resolve("manifest.json").toFile());
        assertEquals("wdbc-grid", m.path("study").asText());
        assertEquals(0.01, m.path("model_l2").asDouble());
        assertEquals(1, m.path("grid").size());
        JsonNode grid = m.path("grid").get(0);
        assertEquals("reciprocal", grid.path("arm").asText());
        assertEquals("rate", grid.path("keys").get(0).path("name").asText());
        assertEquals("[\"0.25\",\"0.5\",\"1.0\"]", grid.path("keys").get(0).path("values").toString());
        assertEquals("[\"0.1\",\"0.3\",\"1.0\"]", grid.path("keys").get(1).path("values").toString());
        assertEquals(9, grid.path("arms").size());
        // plans/grid.yaml: constant is arm 1, the nine expanded arms 2–10, the decay varying fastest
        assertEquals(2, grid.path("arms").get(0).path("index").asInt());
        assertEquals("[\"0.5\",\"0.3\"]", grid.path("arms").get(4).path("values").toString());

        String html = section(Files.readString(study.resolve("report.html")), "grid");
        assertTrue(html.contains("<h3>Arm reciprocal over rate × decay</h3>"), html);
        for (int h = 1; h <= 4; h++) {
            String svg = html.substring(html.indexOf("id=\"heatmap-" + h + "\""));
            svg = svg.substring(0, svg.indexOf("</svg>"));
            assertEquals(9, svg.split("class=\"cell\"", -1).length - 1, "heatmap " + h + " has a cell per arm");
        }
        assertFalse(html.contains("id=\"heatmap-5\""), "tail radius, final gap, test loss, test accuracy");
        for (String tick : List.of(">0.25</text>", ">0.5</text>", ">1.0</text>", ">0.1</text>", ">0.3</text>")) {
            assertTrue(html.contains(tick), tick);
        }
    }

    @Test
    void armsNamedLikeGridArmsAreNotAGrid() throws Exception {
        Path plan = dir.resolve("foo.yaml");
        Files.writeString(plan, StudyRunnerTest.plan("foo", 3, String.join("\n",
                "  - name: 'foo[a=1,b=2]'",
                "    schedule: {kind: constant, rate: 0.2}",
                "  - name: 'foo[a=2,b=2]'",
                "    schedule: {kind: constant, rate: 0.1}")));
        Path study = dir.resolve("foo");
        run(plan, study);
        StudySchema.validate(study);
        assertEquals(0, MAPPER.readTree(study.resolve("manifest.json").toFile()).path("grid").size());
        String html = section(Files.readString(study.resolve("report.html")), "grid");
        assertFalse(html.contains("heatmap"), html);
        assertTrue(html.contains("The plan has no grid"));
    }

    @Test
    void runningTheResolvedPlanAgainKeepsTheRecordedGrid() throws Exception {
        Path plan = dir.resolve("g.yaml");
        Files.writeString(plan, StudyRunnerTest.plan("g", 3, "").replace("arms:\n", "arms:\n"
                + "  - name: r\n    schedule: {kind: reciprocal, rate: 0.3, decay: 0.5}\n")
                + "grid:\n  - {arm: r, rate: [0.1, 0.2], decay: [0.5, 2]}\n");
        Path study = dir.resolve("g");
        run(plan, study);
        JsonNode first = MAPPER.readTree(study.resolve("manifest.json").toFile()).path("grid");
        assertEquals(4, first.get(0).path("arms").size());
        // The resolved plan.yaml has the grid expanded and the same hash: the study resumes (nothing to train) and
        // keeps the grid the first run recorded.
        Path resolved = dir.resolve("resolved.yaml");
        Files.copy(study.resolve("plan.yaml"), resolved);
        run(resolved, study);
        assertEquals(first, MAPPER.readTree(study.resolve("manifest.json").toFile()).path("grid"));
        assertTrue(section(Files.readString(study.resolve("report.html")), "grid").contains("id=\"heatmap-1\""));
        // A fresh run of the resolved plan knows no grid.
        run(resolved, study, "--fresh");
        assertEquals(0, MAPPER.readTree(study.resolve("manifest.json").toFile()).path("grid").size());
        StudySchema.validate(study);
    }
}
