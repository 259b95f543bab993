package settle.experiments.cli;

import java.io.PrintWriter;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Spec;

/**
 * The {@code settle} command. Subcommands are thin: they parse options, call the modules and map failures
 * onto the exit codes of DESIGN.md (0 success, 1 the work failed, 2 bad input, 3 finished with diverged or
 * missing replicates, 130 interrupted).
 */
@Command(
        name = "settle",
        mixinStandardHelpOptions = true,
        versionProvider = Main.Version.class,
        description = "Does learning-rate decay shrink the SGD noise ball on your data? "
                + "Seed-paired studies of learning-rate schedules.",
        subcommands = {DemoCommand.class, RunCommand.class, CheckCommand.class, ReportCommand.class, RatesCommand.class, TraceCommand.class, MinimumCommand.class, DatasetsCommand.class, FollowCommand.class, NudgeCommand.class, ProbeCommand.class, CommandLine.HelpCommand.class})
public final class Main implements Callable<Integer> {

    /** Exit code: success, warnings included. */
    public static final int OK = 0;
    /** Exit code: the work failed (I/O error, lock held, no minimiser, every replicate diverged). */
    public static final int FAILED = 1;
    /** Exit code: bad input (plan, options, data). */
    public static final int BAD_INPUT = 2;
    /** Exit code: finished, but some replicates diverged or are missing. */
    public static final int INCOMPLETE = 3;
    /** Exit code: interrupted. */
    public static final int INTERRUPTED = 130;

    @Spec
    private CommandSpec spec;

    @Override
    public Integer call() {
        spec.commandLine().usage(spec.commandLine().getOut());
        return OK;
    }

    /** @return the configured command line, with settle's exit codes and error handling */
    public static CommandLine commandLine() {
        CommandLine cl = new CommandLine(new Main());
        applyExitCodes(cl);
        cl.setParameterExceptionHandler(Main::oneLineUsageError);
        return cl;
    }

    /**
     * Bad options get one line on stderr, naming the option and what is accepted, and a pointer to the
     * command's help; never the whole usage text, never a stack trace.
     */
    private static int oneLineUsageError(CommandLine.ParameterException e, String[] args) {
        CommandLine cl = e.getCommandLine();
        PrintWriter err = cl.getErr();
        String command = cl.getCommandSpec().qualifiedName();
        err.println(command + ": " + e.getMessage() + " (see '" + command + " --help')");
        err.flush();
        return BAD_INPUT;
    }

    private static void applyExitCodes(CommandLine cl) {
        cl.getCommandSpec().exitCodeOnInvalidInput(BAD_INPUT);
        cl.getCommandSpec().exitCodeOnExecutionException(FAILED);
        for (CommandLine sub : cl.getSubcommands().values()) {
            applyExitCodes(sub);
        }
    }

    /** Runs settle with {@code args} writing to the given streams; returns the exit code. */
    public static int run(PrintWriter out, PrintWriter err, String... args) {
        CommandLine cl = commandLine();
        cl.setOut(out);
        cl.setErr(err);
        int code = cl.execute(args);
        out.flush();
        err.flush();
        return code;
    }

    public static void main(String[] args) {
        System.exit(commandLine().execute(args));
    }

    /** Reads the version from the jar manifest. */
    static final class Version implements CommandLine.IVersionProvider {
        @Override
        public String[] getVersion() {
            String v = Main.class.getPackage().getImplementationVersion();
            return new String[] {"settle " + (v == null ? "(development build)" : v)};
        }
    }
}
