package settle.cluster;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import settle.experiments.cli.Main;

/** Plans and study-directory checks shared by the cluster tests. */
final class Studies {

    private Studies() {
    }

    /**
     * A small convex plan: logistic regression on seeded Gaussian classes, with a holdout split (so the
     * executors' split is checked too), three arms × four replicates.
     */
    static String convexPlan(String study, String extraArm) {
        return String.join("\n",
                "study: " + study,
                "seed: 11",
                "replicates: 4",
                "data:",
                "  source: synthetic:gaussian?rows=300&features=3&classes=2&separation=1.5&seed=5",
                "  test-fraction: 0.25",
                "  holdout-fraction: 0.2",
                "  standardize: true",
                "model:",
                "  kind: logistic",
                "  l2: 0.01",
                "training:",
                "  epochs: 5",
                "  batch: 8",
                "  snapshots: 20",
                "baseline: constant",
                "arms:",
                "  - name: constant",
                "    schedule: {kind: constant, rate: 0.3}",
                "  - name: reciprocal",
                "    schedule: {kind: reciprocal, rate: 0.3, decay: 0.01, per: update}",
                "  - name: averaged",
                "    schedule: {kind: constant, rate: 0.3}",
                "    average: tail",
                extraArm,
                "");
    }

    /**
     * A non-convex plan of {@code replicates} × 2 arms whose replicates take a few tenths of a second each:
     * a one-hidden-layer MLP on the noisy XOR (as the bundled mlp.yaml, fewer epochs).
     */
    static String mlpPlan(String study, int replicates) {
        return String.join("\n",
                "study: " + study,
                "seed: 2026",
                "replicates: " + replicates,
                "data:",
                "  source: synthetic:xor?rows=600&noise=0.5&seed=1",
                "  test-fraction: 0.25",
                "model:",
                "  kind: mlp",
                "  hidden: [16]",
                "  activation: tanh",
                "  l2: 1.0e-4",
                "  init: glorot",
                "training:",
                "  epochs: 30",
                "  batch: 16",
                "arms:",
                "  - name: constant",
                "    schedule: {kind: constant, rate: 0.2}",
                "  - name: cosine",
                "    schedule: {kind: cosine, rate: 0.2, floor: 0.0}",
                "");
    }

    /** Runs settle in this JVM; returns the exit code. */
    static int settle(StringWriter out, StringWriter err, String... args) {
        return Main.run(new PrintWriter(out), new PrintWriter(err), args);
    }

    /** @return every file under {@code study/arms}, sorted (replicate files and anything else) */
    static List<Path> armFiles(Path study) throws Exception {
        List<Path> files = new ArrayList<>();
        if (!Files.exists(study.resolve("arms"))) {
            return files;
        }
        // by name only (no file attributes): a run may be renaming a partial file into place meanwhile, and a stat
        // of a name that was just renamed away would fail; every entry of arms/ is an arm directory of files
        try (var arms = Files.newDirectoryStream(study.resolve("arms"))) {
            for (Path arm : arms) {
                try (var entries = Files.newDirectoryStream(arm)) {
                    entries.forEach(files::add);
                }
            }
        }
        files.sort(null);
        return files;
    }

    /** Asserts both studies hold the same replicate files, name for name and byte for byte. */
    static void assertSameReplicateFiles(Path expected, Path actual) throws Exception {
        List<Path> left = armFiles(expected);
        List<Path> right = armFiles(actual);
        assertEquals(left.size(), right.size(), "number of files under arms/");
        for (int i = 0; i < left.size(); i++) {
            assertEquals(expected.relativize(left.get(i)), actual.relativize(right.get(i)));
            assertArrayEquals(Files.readAllBytes(left.get(i)), Files.readAllBytes(right.get(i)),
                    "replicate file " + expected.relativize(left.get(i)) + " differs");
        }
    }
}
