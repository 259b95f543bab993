package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static settle.experiments.cli.Cli.run;

import org.junit.jupiter.api.Test;

class RatesCommandTest {

    /** Output and error text of one run, with its exit code. */
    /**
     * The example; the trade's standard 1/t example (common practice): 0.2/(1+1) = 0.1 in epoch 1,
     * 0.2/3 in epoch 2, 0.2/4 = 0.05, 0.2/5 = 0.04; three updates per epoch share the epoch's rate.
     */
    @Test
    void csvListsEveryUpdate() {
        Cli.Result r = run("rates", "{kind: reciprocal, rate: 0.2, decay: 1}", "--epochs", "4", "--updates-per-epoch", "3",
                "--format", "csv");
        assertEquals(0, r.code(), r.err());
        String expected = String.join("\n",
                "epoch,update,rate",
                "1,1,0.1", "1,2,0.1", "1,3,0.1",
                "2,4," + 0.2 / 3, "2,5," + 0.2 / 3, "2,6," + 0.2 / 3,
                "3,7,0.05", "3,8,0.05", "3,9,0.05",
                "4,10,0.04", "4,11,0.04", "4,12,0.04") + "\n";
        assertEquals(expected, r.out().replace("\r\n", "\n"));
        assertEquals("", r.err());
    }

    @Test
    void tableStatesTheCounterConventionAndTheSums() {
        Cli.Result r = run("rates", "{kind: constant, rate: 0.1}", "--epochs", "2", "--updates-per-epoch", "2");
        assertEquals(0, r.code(), r.err());
        String[] lines = r.out().replace("\r\n", "\n").split("\n");
        assertEquals("constant: α = 0.1", lines[0]);
        assertEquals("counters: epoch = 1 for the first pass, update = 1 for the first update, "
                + "progress = (update - 1) / 4 (2 epochs x 2 updates)", lines[1]);
        assertEquals("epoch  update  rate", lines[2]);
        assertEquals("    1       1  0.100000", lines[3]);
        assertEquals("    2       4  0.100000", lines[6]);
        // Σα = 4·0.1 = 0.4; Σα² = 4·0.01 = 0.04
        assertEquals("sum of rates 0.400000, sum of squares 0.0400000 over 4 updates", lines[7]);
        assertTrue(lines[8].startsWith("as the run grows: Σα = ∞, Σα² = ∞"), lines[8]);
    }

    @Test
    void unknownKindExitsTwoWithOneLine() {
        Cli.Result r = run("rates", "{kind: exponental, rate: 0.2, base: 0.9}", "--epochs", "4", "--updates-per-epoch", "3");
        assertEquals(2, r.code());
        assertEquals("settle rates: schedule: unknown schedule kind 'exponental'; did you mean 'exponential'?\n",
                r.err().replace("\r\n", "\n"));
        assertEquals("", r.out());
    }

    @Test
    void negativeRateExitsTwoNamingTheKey() {
        Cli.Result r = run("rates", "{kind: constant, rate: -0.1}", "--epochs", "4", "--updates-per-epoch", "3");
        assertEquals(2, r.code());
        assertEquals("settle rates: schedule: constant: rate = -0.1 is not accepted; expected a finite number > 0\n",
                r.err().replace("\r\n", "\n"));
    }

    @Test
    void warmupLongerThanTheRunExitsTwo() {
        Cli.Result r = run("rates", "{kind: constant, rate: 0.1, warmup: {updates: 13}}", "--epochs", "4",
                "--updates-per-epoch", "3");
        assertEquals(2, r.code());
        assertEquals("settle rates: schedule: constant: warmup.updates = 13 is not accepted; expected at most the "
                + "run's 12 updates (a warmup longer than the run)\n", r.err().replace("\r\n", "\n"));
    }

    @Test
    void malformedYamlExitsTwoWithoutAStackTrace() {
        Cli.Result r = run("rates", "{kind: [", "--epochs", "2", "--updates-per-epoch", "1");
        assertEquals(2, r.code());
        assertEquals(1, r.err().strip().split("\n").length, r.err());
        assertEquals("settle rates: schedule: '{kind: [' is not a YAML map (a syntax error at character 9); expected"
                + " e.g. '{kind: reciprocal, rate: 0.2, decay: 1}'", r.err().strip());
        assertFalse(r.err().contains("\tat "), r.err());
    }

    @Test
    void aScalarIsNotAMap() {
        Cli.Result r = run("rates", "hello", "--epochs", "2", "--updates-per-epoch", "1");
        assertEquals(2, r.code());
        assertEquals("settle rates: schedule: 'hello' is not a YAML map; expected e.g. "
                + "'{kind: reciprocal, rate: 0.2, decay: 1}'\n", r.err().replace("\r\n", "\n"));
    }

    @Test
    void zeroEpochsExitsTwo() {
        Cli.Result r = run("rates", "{kind: constant, rate: 0.1}", "--epochs", "0", "--updates-per-epoch", "1");
        assertEquals(2, r.code());
        assertEquals("settle rates: --epochs = 0 is not accepted; expected an integer ≥ 1\n",
                r.err().replace("\r\n", "\n"));
    }

    @Test
    void missingOptionAndBadFormatExitTwo() {
        assertEquals(2, run("rates", "{kind: constant, rate: 0.1}", "--epochs", "2").code());
        assertEquals(2, run("rates", "{kind: constant, rate: 0.1}", "--epochs", "2", "--updates-per-epoch", "1",
                "--format", "xml").code());
        assertEquals(2, run("rates", "{kind: constant, rate: 0.1}", "--epochs", "two", "--updates-per-epoch", "1")
                .code());
    }
}
