package settle.experiments.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

/**
 * Bad inputs that an earlier settle handled against its promise, each with its exact message and exit code: a plan
 * whose schedule fails late is refused by {@code check} before it says "valid" and by {@code run} with the same line,
 * leaving nothing behind; echoed values are cut; no parser internals; {@code study: ""}; {@code --out} naming a file;
 * command-line typos get a suggestion; and a fault in settle is an internal error, never bad input.
 */
class BadInputMessagesTest {

    @TempDir
    Path dir;

    private record Result(int code, String out, String err) {
    }

    private static Result settle(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.run(new PrintWriter(out), new PrintWriter(err), args);
        return new Result(code, out.toString(), err.toString().strip());
    }

    /** @return a small plan whose second arm has {@code schedule} (line 10, column 15 onwards) */
    private Path plan(String name, String schedule) throws Exception {
        Path p = dir.resolve(name + ".yaml");
        Files.writeString(p, String.join("\n",
                "study: " + name,
                "replicates: 2",
                "data:",
                "  source: synthetic:gaussian?rows=100&features=2",
                "training:",
                "  epochs: 5",
                "  batch: 20",
                "arms:",
                "  - name: c",
                "    schedule: {kind: constant, rate: 0.1}",
                "  - name: late",
                "    schedule: " + schedule,
                ""));
        return p;
    }

    /** {@code check} says nothing on stdout, and {@code run} creates nothing, when the plan fails anywhere. */
    private void refusedByCheckAndRun(Path plan, String message) {
        Result check = settle("check", plan.toString());
        assertEquals(2, check.code(), check.err());
        assertEquals("", check.out(), "no 'valid' and no resolved plan before the error");
        assertEquals(plan + message, check.err());
        Path out = dir.resolve("study-" + plan.getFileName());
        Result run = settle("run", plan.toString(), "--out", out.toString(), "--quiet");
        assertEquals(2, run.code());
        assertEquals(plan + message, run.err(), "run gives check's positioned line");
        assertFalse(Files.exists(out), "no .lock, no plan.yaml: nothing is left behind");
    }

    @Test
    void aFormulaThatDividesByZeroAtEpochOne() throws Exception {
        refusedByCheckAndRun(plan("divide", "{kind: formula, expr: \"0.1 / (epoch - 1)\"}"),
                ":12:37: arms[1].schedule.expr: formula: expr = '0.1 / (epoch - 1)' fails at epoch 1, update 1"
                        + " (Division by zero!); expected a finite rate ≥ 0");
    }

    @Test
    void aRateThatTurnsNegativeLate() throws Exception {
        refusedByCheckAndRun(plan("negative", "{kind: formula, expr: \"0.1 - 0.03 * epoch\"}"),
                ":12:37: arms[1].schedule.expr: formula: expr = '0.1 - 0.03 * epoch' gives -0.01999999999999999 at"
                        + " epoch 4, update 13; expected a finite rate ≥ 0");
    }

    @Test
    void aWarmupLongerThanTheRun() throws Exception {
        refusedByCheckAndRun(plan("warm", "{kind: constant, rate: 0.1, warmup: {epochs: 8}}"),
                ":12:60: arms[1].schedule.warmup.epochs: constant: warmup.epochs = 8 is not accepted; expected at most"
                        + " the run's 5 epochs (a warmup longer than the run)");
    }

    @Test
    void aHugeStudyNameIsCutInTheMessage() throws Exception {
        Path p = plan("huge", "{kind: constant, rate: 0.1}");
        String text = Files.readString(p).replace("study: huge", "study: " + "a".repeat(1_000_000));
        Files.writeString(p, text);
        Result r = settle("check", p.toString());
        assertEquals(2, r.code());
        assertEquals(p + ":1:8: study: must be 1-100 letters, digits, '.', '_' or '-', not starting with '.' (it names"
                + " the study directory), got '" + "a".repeat(60) + "…'", r.err());
    }

    @Test
    void deepBracketsGiveAShortLineWithoutParserInternals() throws Exception {
        Path p = dir.resolve("deep.yaml");
        Files.writeString(p, "study: deep\narms: " + "[".repeat(5000) + "]".repeat(5000) + "\n");
        Result r = settle("check", p.toString());
        assertEquals(2, r.code());
        assertEquals(p + ":2:71: arms[0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][0][…: nested more than 64"
                + " levels deep; a plan nests a few levels (arms, schedule, warmup), so a bracket may be unclosed here",
                r.err());
        assertTrue(r.err().length() < 300, r.err().length() + " characters");
    }

    @Test
    void noParserInternals() throws Exception {
        Path key = dir.resolve("key.yaml");
        Files.writeString(key, "study: s\narms:\n  - {? [a]: b}\n");
        assertEquals(key + ":3:9: arms[0]: YAML syntax: a key must be plain text, not a list or a map; write 'key:"
                + " value'", settle("check", key.toString()).err());
        Path nan = dir.resolve("nan.yaml");
        Files.writeString(nan, "study: s\ndata:\n  source: synthetic:xor\narms:\n  - schedule: {kind: constant,"
                + " rate: .nan}\n");
        assertEquals(nan + ":5:42: arms[0].schedule.rate: YAML syntax: '.nan' is not a finite number; write a number"
                + " such as 0.1 (a plan holds no NaN or infinity)", settle("check", nan.toString()).err());
        Path binary = dir.resolve("binary.yaml");
        Files.writeString(binary, "study: !!binary aGVsbG8=\n");
        assertEquals(binary + ":1:8: study: binary data (!!binary) is not accepted in a plan; write the value as text"
                + " or a number", settle("check", binary.toString()).err());
        Result rates = settle("rates", "{kind: [", "--epochs", "2", "--updates-per-epoch", "1");
        assertFalse(rates.err().contains("while parsing") || rates.err().contains("Event"), rates.err());
    }

    @Test
    void anEmptyStudyNameIsRefused() throws Exception {
        Path p = plan("empty", "{kind: constant, rate: 0.1}");
        Files.writeString(p, Files.readString(p).replace("study: empty", "study: \"\""));
        Result r = settle("check", p.toString());
        assertEquals(2, r.code());
        assertEquals(p + ":1:8: study: is empty; give the study's name (1-100 letters, digits, '.', '_' or '-', not"
                + " starting with '.'), or leave the key out to name it after the plan file", r.err());
    }

    @Test
    void outNamingAFileSaysSo() throws Exception {
        Path p = plan("out", "{kind: constant, rate: 0.1}");
        Path file = Files.writeString(dir.resolve("a-file"), "x");
        Result r = settle("run", p.toString(), "--out", file.toString(), "--quiet");
        assertEquals(2, r.code());
        assertEquals(file + ": --out: a file, not a directory; expected the study directory (it is made if missing)",
                r.err());
        assertEquals("x", Files.readString(file));
    }

    @Test
    void commandLineTyposGetASuggestion() {
        Result command = settle("rnu");
        assertEquals(2, command.code());
        assertEquals("settle: unknown command 'rnu'; did you mean 'run'? (see 'settle --help')", command.err());
        Result option = settle("run", "plan.yaml", "--thread", "2");
        assertEquals(2, option.code());
        assertEquals("settle run: unknown option '--thread'; did you mean '--threads'? (see 'settle run --help')",
                option.err());
    }

    @Test
    void aFaultInSettleIsAnInternalErrorWithItsStackTraceInAFile() throws Exception {
        CommandLine cl = Main.commandLine();
        StringWriter err = new StringWriter();
        cl.setErr(new PrintWriter(err));
        // an IllegalArgumentException is a broken precondition inside settle, not the user's mistake
        int code = Failures.handle(new IllegalArgumentException("rows must be ≥ 1: 0"), cl, null);
        assertEquals(Main.FAILED, code);
        String line = err.toString().strip();
        String prefix = "settle: internal error (a fault in settle, not in its input): java.lang.IllegalArgumentException:"
                + " rows must be ≥ 1: 0; the stack trace is in ";
        assertTrue(line.startsWith(prefix), line);
        Path trace = Path.of(line.substring(prefix.length(), line.indexOf(" (please")));
        try {
            assertTrue(Files.readString(trace).contains("at settle.experiments.cli.BadInputMessagesTest"),
                    "the stack trace is in the file");
        } finally {
            Files.deleteIfExists(trace);
        }
        assertEquals(Main.BAD_INPUT, Failures.exitCode(settle.input.BadInputException.of("--x", "--x is bad")));
        assertEquals(Main.FAILED, Failures.exitCode(new java.io.IOException("disk full")));
        assertEquals(Main.INTERRUPTED, Failures.exitCode(new InterruptedException()));
    }
}
