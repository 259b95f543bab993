package settle.experiments.cli;

import com.fasterxml.jackson.core.JacksonException;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.dataformat.yaml.YAMLFactory;
import java.io.PrintWriter;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import settle.engine.schedule.Asymptotics;
import settle.engine.schedule.RateSums;
import settle.engine.schedule.RunShape;
import settle.engine.schedule.Schedule;
import settle.engine.schedule.Schedules;
import settle.input.BadInputException;

/**
 * {@code settle rates SCHEDULE --epochs E --updates-per-epoch U [--format csv|table]}: previews a schedule
 * without data, one row per update (epoch, update, rate). Bad input prints one line to stderr and exits 2.
 */
@Command(
        name = "rates",
        mixinStandardHelpOptions = true,
        description = {
            "Preview a schedule without data: one row per update (epoch, update, rate).",
            "Counters: epoch = 1 for the first pass, update = 1 for the first update; "
                    + "progress = (update - 1) / total updates. A plateau schedule shows its no-cut envelope."
        })
public final class RatesCommand implements Callable<Integer> {

    /** Output formats. */
    enum Layout { csv, table }

    @Spec
    private CommandSpec spec;

    @Parameters(index = "0", paramLabel = "SCHEDULE",
            description = "the schedule as a YAML map, e.g. '{kind: reciprocal, rate: 0.2, decay: 1}'")
    private String schedule;

    @Option(names = "--epochs", required = true, paramLabel = "E", description = "epochs in the run (≥ 1)")
    private int epochs;

    @Option(names = "--updates-per-epoch", required = true, paramLabel = "U",
            description = "updates in each epoch (≥ 1)")
    private int updatesPerEpoch;

    @Option(names = "--format", paramLabel = "csv|table", defaultValue = "table",
            description = "csv or table (default: ${DEFAULT-VALUE})")
    private Layout format;

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        if (epochs < 1) {
            throw BadInputException.of("--epochs", "--epochs = " + epochs + " is not accepted; expected an integer ≥ 1");
        }
        if (updatesPerEpoch < 1) {
            throw BadInputException.of("--updates-per-epoch", "--updates-per-epoch = " + updatesPerEpoch
                    + " is not accepted; expected an integer ≥ 1");
        }
        Map<String, Object> map = readMap(schedule);
        RunShape shape = new RunShape(epochs, updatesPerEpoch);
        Schedule s;
        double[] rates;
        try {
            s = Schedules.parse(map);
            rates = s.plannedRates(shape);
        } catch (BadInputException e) {
            throw BadInputException.of("schedule", "schedule: " + e.getMessage());
        }
        if (format == Layout.csv) {
            out.println("epoch,update,rate");
            long u = 1;
            for (int e = 1; e <= epochs; e++) {
                for (int i = 0; i < updatesPerEpoch; i++, u++) {
                    out.println(e + "," + u + "," + rates[(int) (u - 1)]);
                }
            }
        } else {
            table(out, s, shape, rates);
        }
        out.flush();
        return Main.OK;
    }

    private static void table(PrintWriter out, Schedule s, RunShape shape, double[] rates) {
        RateSums sums = RateSums.of(rates);
        Asymptotics a = s.asymptotics();
        out.println(s.describe());
        out.println("counters: epoch = 1 for the first pass, update = 1 for the first update, progress = (update - 1) / "
                + shape.totalUpdates() + " (" + shape.epochs() + " epochs x " + shape.updatesPerEpoch() + " updates)");
        if (s.kind().equals("plateau")) {
            out.println("plateau: the no-cut envelope (cuts depend on the losses of a real run)");
        }
        int epochWidth = Math.max(5, Integer.toString(shape.epochs()).length());
        int updateWidth = Math.max(6, Long.toString(shape.totalUpdates()).length());
        String row = "%" + epochWidth + "s  %" + updateWidth + "s  %s%n";
        out.printf(Locale.ROOT, row, "epoch", "update", "rate");
        long u = 1;
        for (int e = 1; e <= shape.epochs(); e++) {
            for (int i = 0; i < shape.updatesPerEpoch(); i++, u++) {
                out.printf(Locale.ROOT, row, e, u, String.format(Locale.ROOT, "%.6g", rates[(int) (u - 1)]));
            }
        }
        out.printf(Locale.ROOT, "sum of rates %.6g, sum of squares %.6g over %d updates%n", sums.sum(),
                sums.sumOfSquares(), shape.totalUpdates());
        out.println("as the run grows: " + a.description());
    }

    /**
     * Reads a YAML flow map such as {@code {kind: constant, rate: 0.1}}.
     *
     * @throws BadInputException with a one-line message when the text is not a YAML map
     */
    static Map<String, Object> readMap(String text) {
        Object value;
        try {
            value = new ObjectMapper(new YAMLFactory()).readValue(text, Object.class);
        } catch (JacksonException e) {
            // the parser's own words name its internals: say where, in ours
            var at = e.getLocation();
            throw BadInputException.of("schedule", "schedule: " + BadInputException.shown(text) + " is not a YAML map"
                    + (at == null || at.getColumnNr() < 1 ? "" : " (a syntax error at character " + at.getColumnNr()
                            + ")") + "; expected e.g. '{kind: reciprocal, rate: 0.2, decay: 1}'");
        }
        if (!(value instanceof Map<?, ?> m)) {
            throw BadInputException.of("schedule", "schedule: " + BadInputException.shown(text) + " is not a YAML"
                    + " map; expected e.g. '{kind: reciprocal, rate: 0.2, decay: 1}'");
        }
        @SuppressWarnings("unchecked")
        Map<String, Object> typed = (Map<String, Object>) m;
        return typed;
    }
}
