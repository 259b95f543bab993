package settle.reports.format;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.charset.StandardCharsets;
import java.util.List;
import org.junit.jupiter.api.Test;
import settle.input.BadInputException;

/**
 * {@code manifest.json} written by {@link ManifestJson#write} and read back by {@link ManifestJson#read}: every field
 * comes back as written, the {@code training} block included, and writing what was read gives the same bytes.
 */
class ManifestJsonTest {

    private static final String FILE = "study/manifest.json";

    static Manifest manifest(Manifest.Training training) {
        return new Manifest(StudyFormat.VERSION, "round-trip", new Manifest.Tool("settle", "0.1.0", "abc"),
                new Manifest.Jvm("vendor", "vm", "17"), new Manifest.Cpu("cpu", "amd64", 2), "local", 2,
                List.of("settle", "run", "plan.yaml"), "L64X128MixRandom", -7L, "2026-01-01T00:00:00Z",
                "2026-01-01T00:01:00Z", "aa", "bb", "cc", "dd",
                new Manifest.Data("synthetic:test", 100, 2, List.of("x1", "x2"), List.of("no", "yes"), 60, 25, 15, 4),
                new Manifest.Standardisation(new double[] {0.5, -1.25}, new double[] {1, 0.1}),
                "binary logistic regression", 3, 1e-3, training, StudyFormat.REFERENCE, "constant",
                List.of("constant", "decay"), List.of("constant-" + "0".repeat(12), "decay-" + "1".repeat(12)),
                List.of(), List.of(new Manifest.Status(1, 1, Replicate.FINISHED),
                        new Manifest.Status(2, 1, Replicate.DIVERGED)));
    }

    @Test
    void theTrainingSettingsComeBackAsWritten() {
        Manifest.Training training = new Manifest.Training(7, 16, "replacement", 0.9, 0.3, 5);
        byte[] bytes = ManifestJson.write(manifest(training));
        String text = new String(bytes, StandardCharsets.UTF_8);
        assertTrue(text.contains("\"training\" : {\n    \"epochs\" : 7,\n    \"batch\" : 16,\n    \"sampling\" :"
                + " \"replacement\",\n    \"momentum\" : 0.9,\n    \"tail\" : 0.3,\n    \"snapshots\" : 5\n  }"), text);
        Manifest read = ManifestJson.read(bytes, FILE, "settle run plan.yaml --out study --fresh");
        assertEquals(training, read.training());
        assertEquals(28, read.plannedUpdates(), "7 epochs of 4 updates");
        assertEquals("round-trip", read.study());
        assertEquals(-7L, read.rootSeed());
        assertEquals(List.of("constant", "decay"), read.arms());
        assertArrayEquals(new double[] {1, 0.1}, read.standardisation().scales());
        assertArrayEquals(bytes, ManifestJson.write(read), "what is read writes the same bytes");
    }

    @Test
    void plainSgdWithTheWholeRunAsItsTailRoundTrips() {
        // the ends of the accepted ranges: β = 0 is accepted, τ = 1 is accepted
        Manifest.Training training = new Manifest.Training(1, 1, "shuffle", 0.0, 1.0, 1);
        byte[] bytes = ManifestJson.write(manifest(training));
        assertEquals(training, ManifestJson.read(bytes, FILE, "rerun").training());
    }

    @Test
    void aDamagedTrainingFieldIsRefusedWithOneLineNamingIt() {
        byte[] bytes = ManifestJson.write(manifest(new Manifest.Training(7, 16, "shuffle", 0.5, 0.3, 5)));
        String text = new String(bytes, StandardCharsets.UTF_8);
        String[][] cases = {
            {"\"epochs\" : 7", "\"epochs\" : -7", "training.epochs: must be a whole number in [1, 2147483647], not -7"},
            {"\"batch\" : 16", "\"batch\" : 16.5", "training.batch: must be a whole number in [1, 2147483647], not 16.5"},
            {"\"sampling\" : \"shuffle\"", "\"sampling\" : \"random\"",
                "training.sampling: must be one of shuffle, replacement, not the text 'random'"},
            {"\"momentum\" : 0.5", "\"momentum\" : -0.5", "training.momentum: must be a number in [0, 1), not -0.5"},
            {"\"tail\" : 0.3", "\"tail\" : 1.5", "training.tail: must be a number in (0, 1], not 1.5"},
            {"\"snapshots\" : 5", "\"snapshots\" : true", "training.snapshots: must be a whole number in [1, 2147483647], not true"},
            {"\"snapshots\" : 5", "\"snapshot\" : 5", "training.snapshots: missing; every 'training' has it"},
        };
        for (String[] c : cases) {
            assertTrue(text.contains(c[0]), c[0]);
            byte[] damaged = text.replace(c[0], c[1]).getBytes(StandardCharsets.UTF_8);
            String message = assertThrows(BadInputException.class, () -> ManifestJson.read(damaged, FILE, "rerun"))
                    .getMessage();
            assertEquals(FILE + ": " + c[2], message);
        }
    }
}
