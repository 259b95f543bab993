package settle.experiments.cli;

import java.io.PrintWriter;
import java.io.StringWriter;

/** Runs the {@code settle} command line in the test's JVM and keeps what it printed. */
final class Cli {

    private Cli() {
    }

    /** What one command did: its exit code, stdout and stderr. */
    record Result(int code, String out, String err) {
    }

    /** @return the exit code and output of {@code settle ARGS} */
    static Result run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.run(new PrintWriter(out), new PrintWriter(err), args);
        return new Result(code, out.toString(), err.toString());
    }
}
