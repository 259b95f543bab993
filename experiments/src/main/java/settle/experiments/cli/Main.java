package settle.experiments.cli;

import java.io.PrintWriter;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Spec;

/**
 * The {@code settle} command. Subcommands are thin: they parse options, call the modules and return 0 or 3; a
 * failure they throw is mapped to its exit code and its line in one place, {@link Failures} (0 success, 1 the work
 * failed, 2 bad input, 3 finished with diverged or missing replicates, 130 interrupted), and a bad option or an
 * unknown command or option to exit 2 with a suggestion ({@link #oneLineUsageError}).
 */
@Command(
        name = "settle",
        mixinStandardHelpOptions = true,
        versionProvider = Main.Version.class,
        description = "Does learning-rate decay shrink the SGD noise ball on your data? "
                + "Seed-paired studies of learning-rate schedules.",
        subcommands = {DemoCommand.class, RunCommand.class, CheckCommand.class, ReportCommand.class, CompareCommand.class, RatesCommand.class, TraceCommand.class, MinimumCommand.class, DatasetsCommand.class, FollowCommand.class, NudgeCommand.class, ProbeCommand.class, CommandLine.HelpCommand.class})
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
        Choices.register(cl);
        cl.setParameterExceptionHandler(Main::oneLineUsageError);
        cl.setExitCodeExceptionMapper(Failures::exitCode);
        cl.setExecutionExceptionHandler(Failures::handle);
        return cl;
    }

    /**
     * Bad options get one line on stderr, naming the option and what is accepted, and a pointer to the
     * command's help; never the whole usage text, never a stack trace. An unknown command or option gets the
     * nearest known one as a suggestion ({@code settle rnu}: did you mean 'run'?).
     */
    private static int oneLineUsageError(CommandLine.ParameterException e, String[] args) {
        CommandLine cl = e.getCommandLine();
        PrintWriter err = cl.getErr();
        String command = cl.getCommandSpec().qualifiedName();
        String message = e.getMessage();
        if (e instanceof CommandLine.UnmatchedArgumentException u && !u.getUnmatched().isEmpty()) {
            message = unmatched(cl, u.getUnmatched().get(0));
        } else if (cl.getCommand() instanceof TraceCommand) {
            message = TraceCommand.explain(message, java.util.List.of(args));
        }
        if (message != null && message.startsWith("Error: ")) {
            message = message.substring("Error: ".length());
        }
        err.println(command + ": " + message + " (see '" + command + " --help')");
        err.flush();
        return BAD_INPUT;
    }

    /** @return the line for an argument no command or option takes, with the nearest known name */
    private static String unmatched(CommandLine cl, String given) {
        CommandLine.Model.CommandSpec spec = cl.getCommandSpec();
        String shown = settle.input.BadInputException.shown(given);
        if (given.startsWith("-")) {
            String name = given.contains("=") ? given.substring(0, given.indexOf('=')) : given;
            java.util.List<String> options = new java.util.ArrayList<>();
            for (CommandLine.Model.OptionSpec o : spec.options()) {
                options.addAll(java.util.List.of(o.names()));
            }
            String near = settle.engine.text.NearMiss.closest(name, options);
            return "unknown option " + shown + (near == null ? "; the options are listed by --help"
                    : "; did you mean '" + near + "'?");
        }
        if (!spec.subcommands().isEmpty()) {
            String near = settle.engine.text.NearMiss.closest(given, spec.subcommands().keySet());
            return "unknown command " + shown + (near == null ? "; the commands are listed by --help"
                    : "; did you mean '" + near + "'?");
        }
        return "unexpected argument " + shown + "; " + spec.qualifiedName() + " takes "
                + (spec.positionalParameters().isEmpty() ? "no arguments" : "only "
                        + spec.positionalParameters().size() + " argument"
                        + (spec.positionalParameters().size() == 1 ? "" : "s"));
    }

    /** @return settle's version from the jar manifest, or "(development build)" */
    static String version() {
        String v = Main.class.getPackage().getImplementationVersion();
        return v == null ? "(development build)" : v;
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
            return new String[] {"settle " + version()};
        }
    }
}
