package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static settle.experiments.cli.Cli.run;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code settle minimum}: output, --out, and the exit codes of DESIGN.md. */
class MinimumCommandTest {

    /**
     * F(θ*) on standardised WDBC with λ = 0.01 from scikit-learn 1.2.1 (Debian), the value make_fixture.py in
     * engine/src/test/resources/settle/engine/minimum wrote to wdbc.reference.
     */
    private static final double WDBC_OBJECTIVE = 0.09959137548470548;
    private static final double OBJECTIVE_TOLERANCE = 1e-8;

    private static double valueAfter(String text, String prefix) {
        for (String line : text.lines().toList()) {
            if (line.startsWith(prefix)) {
                return Double.parseDouble(line.substring(prefix.length()).trim());
            }
        }
        throw new AssertionError("no line starting with '" + prefix + "' in:\n" + text);
    }

    @Test
    void printsTheMinimiserOfStandardisedWdbc() {
        Cli.Result r = run("minimum", "--data", "bundled:wdbc", "--standardize", "--model", "logistic", "--l2", "0.01");
        assertEquals(0, r.code(), r.err());
        assertEquals(WDBC_OBJECTIVE, valueAfter(r.out(), "F(θ*):"), OBJECTIVE_TOLERANCE * WDBC_OBJECTIVE);
        assertTrue(r.out().contains("method: newton"), r.out());
        assertTrue(r.out().contains("H eigenvalues on the gauge-free subspace (31 of 31 directions): min "), r.out());
        assertTrue(r.out().contains("θ* (31 values, the 30 weights, then the bias):"), r.out());
    }

    @Test
    void writesThetaOnePerLine(@TempDir Path dir) throws IOException {
        Path file = dir.resolve("theta.csv");
        Cli.Result r = run("minimum", "--data", "bundled:wine", "--standardize", "--l2", "0.01", "--out", file.toString());
        assertEquals(0, r.code(), r.err());
        List<String> lines = Files.readAllLines(file, StandardCharsets.UTF_8);
        assertEquals(42, lines.size()); // 3 cultivars × 13 weights, then 3 biases
        double biasSum = 0;
        for (int k = 39; k < 42; k++) {
            biasSum += Double.parseDouble(lines.get(k));
        }
        assertEquals(0.0, biasSum, 1e-12, "softmax biases centred");
        assertTrue(r.out().contains("(41 of 42 directions)"), r.out());
    }

    @Test
    void separableDataWithoutPenaltyFailWithExitOne(@TempDir Path dir) throws IOException {
        Path csv = dir.resolve("apart.csv");
        Files.writeString(csv, "a,b,y\n0,1,no\n0.5,2,no\n1,0.3,no\n3,1,yes\n3.5,0,yes\n4,2,yes\n");
        Cli.Result r = run("minimum", "--data", "csv:" + csv, "--label", "y", "--l2", "0");
        assertEquals(1, r.code(), r.out() + r.err());
        assertEquals("settle minimum: no minimiser exists: the training data are linearly separable and l2 = 0;"
                + " set model.l2 > 0", r.err().strip());
    }

    @Test
    void badInputExitsWithTwo() {
        Cli.Result unknown = run("minimum", "--data", "bundled:nosuch");
        assertEquals(2, unknown.code());
        assertEquals(1, unknown.err().strip().lines().count(), unknown.err());
        assertTrue(unknown.err().startsWith("bundled:nosuch: no such bundled dataset"), unknown.err());

        Cli.Result mlp = run("minimum", "--data", "bundled:wine", "--model", "mlp");
        assertEquals(2, mlp.code());
        assertEquals("settle minimum: --model mlp has no exact minimiser; accepted: logistic", mlp.err().strip());

        Cli.Result negative = run("minimum", "--data", "bundled:wine", "--l2", "-1");
        assertEquals(2, negative.code());
        assertEquals("settle minimum: --l2 = -1.0 is not accepted; expected a finite number ≥ 0", negative.err().strip());

        assertEquals(2, run("minimum", "--data", "bundled:wine", "--l2", "abc").code());
        assertEquals(2, run("minimum").code());
    }

    @Test
    void aPlanGivesItsStudysDataAndModelAndOnlyOneFormIsTaken(@TempDir Path dir) throws IOException {
        Path mlp = dir.resolve("mlp.yaml");
        Files.writeString(mlp, String.join("\n", "study: m", "data:", "  source: bundled:wine",
                "model: {kind: mlp, hidden: [4]}", "arms:", "  - name: a", "    schedule: {kind: constant, rate: 0.1}",
                ""));
        Cli.Result r = run("minimum", "--plan", mlp.toString());
        assertEquals(2, r.code(), r.out() + r.err());
        assertEquals(mlp + ":4:15: model.kind: mlp has no exact minimiser; settle minimum accepts logistic",
                r.err().strip());

        Cli.Result both = run("minimum", "--plan", mlp.toString(), "--data", "bundled:wine");
        assertEquals(2, both.code());
        assertTrue(both.err().contains("mutually exclusive"), both.err());
    }

    @Test
    void aTableWithGapsUnderDataSaysThatItsKeysGoInAPlan() {
        // the bundled votes have gaps, which --data (every data key at its default) refuses
        Cli.Result r = run("minimum", "--data", "bundled:housevotes84");
        assertEquals(2, r.code(), r.out() + r.err());
        assertEquals(1, r.err().strip().lines().count(), r.err());
        assertTrue(r.err().startsWith("settle minimum: bundled:housevotes84: missing cells"), r.err());
        assertTrue(r.err().strip().endsWith("; --data takes every data key's default: set data.missing in a plan and"
                + " give it as --plan PLAN"), r.err());
    }
}
