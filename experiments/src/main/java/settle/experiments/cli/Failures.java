package settle.experiments.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.concurrent.CompletionException;
import java.util.concurrent.ExecutionException;
import picocli.CommandLine;
import settle.engine.minimum.NoMinimiserException;
import settle.experiments.run.WorkFailedException;
import settle.input.BadInputException;

/**
 * The one place where a failure that escapes a command becomes its exit code and its line on stderr (picocli's
 * exit-code mapping and execution-exception handler, set up by {@link Main#commandLine()}):
 *
 * <ul>
 *   <li>{@link BadInputException}: exit 2 ({@link Main#BAD_INPUT}), its message alone (one line naming the file, line,
 *       column or key and what is accepted; {@code settle COMMAND: } in front when it names no file);</li>
 *   <li>the work failed — an I/O error ({@link IOException}, a lock held by a live run included), no minimiser, a
 *       cluster job that failed ({@link WorkFailedException}):
 *       exit 1 ({@link Main#FAILED}), {@code settle COMMAND: } and the reason;</li>
 *   <li>interrupted: exit 130 ({@link Main#INTERRUPTED});</li>
 *   <li>anything else is a fault in settle, never the user's: exit 1, one line saying "internal error" and the path
 *       of a file that holds the stack trace.</li>
 * </ul>
 */
final class Failures {

    private Failures() {
    }

    /** @return the failure a command threw, unwrapped from the executor's and the stream's wrappers */
    static Throwable unwrap(Throwable e) {
        Throwable t = e;
        while ((t instanceof ExecutionException || t instanceof CompletionException
                || t instanceof CommandLine.ExecutionException || t instanceof UncheckedIOException)
                && t.getCause() != null) {
            t = t.getCause();
        }
        return t;
    }

    /** picocli's exit-code mapping: the exit code of a failure. */
    static int exitCode(Throwable e) {
        Throwable t = unwrap(e);
        if (t instanceof BadInputException) {
            return Main.BAD_INPUT;
        }
        if (t instanceof InterruptedException) {
            return Main.INTERRUPTED;
        }
        return Main.FAILED;
    }

    /** picocli's execution-exception handler: prints the failure's one line and returns its exit code. */
    static int handle(Exception e, CommandLine cl, CommandLine.ParseResult parsed) {
        Throwable t = unwrap(e);
        PrintWriter err = cl.getErr();
        String command = cl.getCommandSpec().qualifiedName();
        if (t instanceof BadInputException b) {
            err.println(b.file().isEmpty() ? command + ": " + b.getMessage() : b.getMessage());
        } else if (t instanceof InterruptedException) {
            Thread.currentThread().interrupt();
            err.println(command + ": interrupted; what was finished is kept, run the same command again to go on");
        } else if (t instanceof IOException || t instanceof NoMinimiserException || t instanceof WorkFailedException) {
            err.println(command + ": " + oneLine(t.getMessage() == null ? t.toString() : t.getMessage()));
        } else {
            err.println(command + ": internal error (a fault in settle, not in its input): " + oneLine(t.toString())
                    + "; " + traceFile(t, parsed));
        }
        err.flush();
        return exitCode(t);
    }

    /** @return where the stack trace went, in words */
    private static String traceFile(Throwable t, CommandLine.ParseResult parsed) {
        StringWriter trace = new StringWriter();
        try (PrintWriter w = new PrintWriter(trace)) {
            w.println("settle " + String.join(" ", parsed == null ? java.util.List.of() : parsed.originalArgs()));
            w.println("at " + Instant.now() + ", Java " + System.getProperty("java.runtime.version", "")
                    + ", settle " + Main.version());
            t.printStackTrace(w);
        }
        try {
            Path file = Files.createTempFile("settle-internal-error-", ".txt");
            Files.writeString(file, trace.toString(), StandardCharsets.UTF_8);
            return "the stack trace is in " + file.toAbsolutePath() + " (please include it in a report of this fault)";
        } catch (IOException | RuntimeException e) {
            return "the stack trace could not be written (" + e + ")";
        }
    }

    private static String oneLine(String s) {
        String line = s.replaceAll("\\s*[\\r\\n]+\\s*", " ").trim();
        return line.length() <= BadInputException.MESSAGE_LIMIT ? line
                : line.substring(0, BadInputException.MESSAGE_LIMIT - 1) + "…";
    }
}
