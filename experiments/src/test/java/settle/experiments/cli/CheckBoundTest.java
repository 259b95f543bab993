package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code settle check} prints each arm's convex last-iterate bound, labelled a bound, and ranks the arms by it. */
class CheckBoundTest {

    @TempDir
    Path dir;

    @Test
    void armsAreRankedByTheBoundAndItIsLabelledABound() throws Exception {
        Path plan = dir.resolve("b.yaml");
        Files.writeString(plan, String.join("\n",
                "study: b",
                "data:",
                "  source: bundled:wdbc",
                "training:",
                "  epochs: 20",
                "  snapshots: 10",
                "arms:",
                "  - name: constant",
                "    schedule: {kind: constant, rate: 0.5}",
                "  - name: linear",
                "    schedule: {kind: anneal, rate: 0.5, floor: 0, power: 1}",
                ""));
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, Main.run(new PrintWriter(out), new PrintWriter(err), "check", plan.toString()), err.toString());
        String text = out.toString();
        assertTrue(text.contains("a worst-case BOUND on E[F(θ_T)] − F(θ*), not a prediction"), text);
        assertTrue(text.contains("Schaipp et al., ICML 2025, Thm 1"), text);
        // same peak rate: linear decay to 0 ranks before the constant rate (Defazio et al. 2023: linear decay is
        // worst-case optimal for the last iterate; on this plan the values are about 1.32 and 4.08)
        int rankOne = text.indexOf("  1    #2 ");
        int rankTwo = text.indexOf("  2    #1 ");
        assertTrue(rankOne > 0 && rankTwo > rankOne, text);
    }
}
