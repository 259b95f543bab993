package settle.engine.train;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.engine.model.Kernels;

/**
 * The arms trained together give every arm what it gets alone on the scalar path too: the checks of
 * {@link ArmGroupTest} that stack arms into one product run again in a JVM started with {@code -Dsettle.kernels=scalar}
 * (the test JVM itself runs the vector path).
 */
class ScalarPathTest {

    @Test
    void armsTogetherAreTheArmsAloneOnTheScalarPath(@TempDir Path dir) throws Exception {
        Path java = Path.of(System.getProperty("java.home"), "bin", "java");
        Path log = dir.resolve("scalar.log");
        Process child = new ProcessBuilder(List.of(java.toString(), "-Dsettle.kernels=scalar", "-cp",
                System.getProperty("java.class.path"), ScalarPathTest.class.getName()))
                .redirectErrorStream(true).redirectOutput(log.toFile()).start();
        assertTrue(child.waitFor(5, TimeUnit.MINUTES), "the scalar run finished in time");
        String output = Files.readString(log);
        assertEquals(0, child.exitValue(), output);
        assertTrue(output.contains("scalar"), "the child ran the scalar path: " + output);
    }

    /** Runs in the child JVM: the stacking checks of {@link ArmGroupTest}; exit code 1 when one fails. */
    public static void main(String[] args) {
        System.out.println("kernels: " + Kernels.describe());
        if (Kernels.vectorised()) {
            System.out.println("expected the scalar path");
            System.exit(1);
        }
        ArmGroupTest checks = new ArmGroupTest();
        try {
            checks.softmaxArmsTogetherAreTheArmsAlone();
            checks.softmaxArmsTogetherOnTheWideProductsAreTheArmsAlone();
            checks.mlpArmsTogetherAreTheArmsAlone();
        } catch (AssertionError e) {
            e.printStackTrace(System.out);
            System.exit(1);
        }
        System.out.println("all arms identical");
    }
}
