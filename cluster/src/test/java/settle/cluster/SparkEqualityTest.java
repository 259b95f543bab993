package settle.cluster;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static settle.cluster.Studies.assertSameReplicateFiles;
import static settle.cluster.Studies.settle;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The same plan on local threads and on Spark's {@code local[2]} gives the same study, byte for byte. */
class SparkEqualityTest {

    private static final ObjectMapper MAPPER = new ObjectMapper();

    @TempDir
    Path dir;

    @Test
    void aPlanRunOnSparkGivesTheLocalRunsReplicateFilesAndEpochsTable() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, Studies.convexPlan("equal", ""));
        Path local = dir.resolve("local");
        Path spark = dir.resolve("spark");
        StringWriter err = new StringWriter();
        assertEquals(0, settle(new StringWriter(), err, "run", plan.toString(), "--out", local.toString(),
                "--threads", "2", "--quiet"), err.toString());
        StringWriter out = new StringWriter();
        assertEquals(0, settle(out, err, "run", plan.toString(), "--out", spark.toString(), "--cluster", "local[2]",
                "--quiet", "--json"), err.toString());

        assertEquals(2 * 12, Studies.armFiles(spark).size(), "12 replicates, each a JSON file and its binary file");
        assertSameReplicateFiles(local, spark);
        for (String name : new String[] {"epochs.csv", "reference.json", "plan.yaml"}) {
            assertArrayEquals(Files.readAllBytes(local.resolve(name)), Files.readAllBytes(spark.resolve(name)), name);
        }
        assertEquals(12, MAPPER.readTree(out.toString()).path("trained_now").asInt());
        JsonNode manifest = MAPPER.readTree(spark.resolve("manifest.json").toFile());
        assertEquals("Apache Spark 4.2.0, master local[2]", manifest.path("executor").asText());
        assertEquals(2, manifest.path("threads").asInt());
        JsonNode localManifest = MAPPER.readTree(local.resolve("manifest.json").toFile());
        for (String key : new String[] {"plan_sha256", "data_sha256", "split_sha256", "replicates", "data"}) {
            assertEquals(localManifest.path(key), manifest.path(key), key);
        }
    }
}
