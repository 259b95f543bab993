package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.experiments.study.ClusterExecutorFactory;

/** {@code settle run --cluster} in the plain build, which holds no cluster engine. */
class ClusterOptionTest {

    @TempDir
    Path dir;

    @Test
    void withoutTheClusterBuildTheRunIsRefusedInOneLineThatSaysHowToGetIt() throws Exception {
        Path plan = dir.resolve("plan.yaml");
        Files.writeString(plan, String.join("\n",
                "study: no-cluster",
                "replicates: 2",
                "data: {source: \"synthetic:gaussian?rows=60&features=2&classes=2&seed=1\"}",
                "training: {epochs: 1}",
                "arms:",
                "  - schedule: {kind: constant, rate: 0.1}",
                ""));
        Path study = dir.resolve("s");
        StringWriter err = new StringWriter();
        int code = Main.run(new PrintWriter(new StringWriter()), new PrintWriter(err), "run", plan.toString(),
                "--cluster", "local[2]", "--out", study.toString(), "--quiet");
        assertEquals(Main.BAD_INPUT, code);
        assertEquals("settle run: --cluster needs settle's cluster build, which is not on the class path: "
                + ClusterExecutorFactory.HOW_TO_GET_IT, err.toString().trim());
        assertFalse(Files.exists(study), "a refused run must not create the study directory");
    }
}
