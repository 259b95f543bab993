package settle.experiments.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import settle.engine.minimum.Curvature;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import settle.engine.probe.RangeTest;
import settle.engine.schedule.RunShape;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.ParsedPlan;
import settle.experiments.plan.PlanData;
import settle.experiments.plan.PlanParser;
import settle.experiments.probe.Probe;
import settle.experiments.probe.ProbePage;
import settle.input.BadInputException;
import settle.reports.format.AtomicFile;

/**
 * {@code settle probe PLAN}: a learning-rate range test on the plan's data and model ({@link Probe}), printed as a
 * table of the objective along each sweep, each sweep's reading, the stability bound 2(1 + β)/λmax(H) for convex
 * models and the suggested initial-rate range with the reasons for its ends, and drawn in an HTML page
 * ({@link ProbePage}).
 */
@Command(name = "probe", mixinStandardHelpOptions = true,
        description = "Learning-rate range test on a plan's data and model: a suggested initial-rate range.")
public final class ProbeCommand implements Callable<Integer> {

    /** Table rows printed per sweep (evenly spaced updates, and the last). */
    static final int TABLE_ROWS = 30;

    @Parameters(index = "0", paramLabel = "PLAN", description = "the plan YAML file")
    Path planFile;

    @Option(names = "--seeds", paramLabel = "S", description = "sweeps, from replicates 1..S (default: the smaller of"
            + " 5 and the plan's replicates)")
    Integer seeds;

    @Option(names = "--updates", paramLabel = "U", description = "updates per sweep (default ${DEFAULT-VALUE})")
    int updates = 300;

    @Option(names = "--from", paramLabel = "RATE", description = "first rate (default ${DEFAULT-VALUE})")
    double from = 1e-5;

    @Option(names = "--to", paramLabel = "RATE", description = "top of the sweep (default ${DEFAULT-VALUE})")
    double to = 100;

    @Option(names = "--html", paramLabel = "FILE", description = "the page (default: studies/<study>-probe.html)")
    Path html;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() throws IOException {
        PrintWriter out = spec.commandLine().getOut();
        if (html != null && Files.isDirectory(html)) {
            throw BadInputException.of("--html", "--html " + html + " is a directory; expected the file to write the"
                    + " page to");
        }
        ParsedPlan parsed = PlanParser.read(planFile);
        int s = seeds != null ? seeds : Math.min(5, parsed.plan().replicates());
        Probe.Result r = Probe.run(parsed, s, from, to, updates);
        String study = parsed.plan().study();
        out.printf(Locale.ROOT, "rate range test of plan %s: %d sweeps (replicates 1..%d), %d updates each, rate"
                + " grown geometrically from %s to %s%n", planFile, r.sweeps().size(), r.sweeps().size(), r.updates(),
                num(r.from()), num(r.to()));
        out.println();
        printTable(out, r);
        out.println();
        for (String line : ProbePage.sweepLines(r)) {
            out.println(line);
        }
        if (Double.isFinite(r.stabilityBound())) {
            out.println("stability bound of the mean at θ*, " + Curvature.boundFormula(r.momentum()) + ": "
                    + num(r.stabilityBound()));
        } else {
            out.println("stability bound: not computed (" + r.boundNote() + ")");
        }
        String cap = r.capLine();
        if (!cap.isEmpty()) {
            out.println(cap);
        }
        out.println("suggested initial-rate range: " + num(r.lower()) + " to " + num(r.upper()));
        for (String line : ProbePage.why(r)) {
            out.println("  " + line);
        }
        List<String> arms = armLines(parsed, planFile, r);
        for (String line : arms) {
            out.println("  " + line);
        }
        Path page = html != null ? html : Places.probePage(study);
        try {
            AtomicFile.write(page, ProbePage.html(study, r, arms));
        } catch (IOException e) {
            throw new IOException("cannot write " + page + ": " + e.getMessage(), e);
        }
        out.println("page: " + page.toAbsolutePath().normalize());
        return Main.OK;
    }

    private static void printTable(PrintWriter out, Probe.Result r) {
        int longest = 0;
        for (RangeTest.Sweep s : r.sweeps()) {
            longest = Math.max(longest, s.rates().length);
        }
        StringBuilder head = new StringBuilder(String.format(Locale.ROOT, "  %6s %11s", "update", "rate"));
        for (int k = 1; k <= r.sweeps().size(); k++) {
            head.append(String.format(Locale.ROOT, " %11s", "F seed " + k));
        }
        out.println(head);
        int step = Math.max(1, (int) Math.ceil(longest / (double) TABLE_ROWS));
        for (int i = 0; i < longest; i++) {
            if (i % step != 0 && i != longest - 1) {
                continue;
            }
            double rate = Double.NaN;
            StringBuilder row = new StringBuilder();
            for (RangeTest.Sweep s : r.sweeps()) {
                if (i < s.rates().length) {
                    rate = s.rates()[i];
                    row.append(String.format(Locale.ROOT, " %11s", num(s.objectives()[i])));
                } else {
                    row.append(String.format(Locale.ROOT, " %11s", "ended"));
                }
            }
            out.println(String.format(Locale.ROOT, "  %6d %11s", i + 1, num(rate)) + row);
        }
    }

    /**
     * @return one line per arm: its largest planned rate, where that lies against the suggested range and, outside
     *     it, what that means and how to check the arm
     */
    static List<String> armLines(ParsedPlan parsed, Path planFile, Probe.Result r) {
        List<String> lines = new ArrayList<>();
        RunShape shape = PlanData.load(parsed).shape(parsed.plan());
        for (int i = 0; i < parsed.plan().arms().size(); i++) {
            ArmPlan a = parsed.plan().arms().get(i);
            double max = 0;
            for (double v : a.schedule().schedule().plannedRates(shape)) {
                max = Math.max(max, v);
            }
            String where;
            if (!Double.isFinite(r.upper())) {
                where = "no suggested range to compare with";
            } else if (max > r.upper()) {
                where = "above the suggested range (" + ProbePage.times(max / r.upper()) + " × its upper end):"
                        + " past the sweeps' lowest objective; see that its first epochs fall with settle trace --plan "
                        + word(planFile.toString()) + " --arm " + word(a.name()) + " --replicate 1";
            } else if (max < r.lower()) {
                where = "below the suggested range (its lower end is " + ProbePage.times(r.lower() / max) + " ×"
                        + " this): the sweeps had made less than half their fall by this rate; expect a slow start";
            } else {
                where = "inside the suggested range";
            }
            lines.add("arm #" + (i + 1) + " '" + a.name() + "': largest planned rate " + num(max) + ", " + where);
        }
        return lines;
    }

    private static String num(double v) {
        return ProbePage.num(v);
    }

    /** @return {@code text} as one shell word: as it is when plain, else in single quotes */
    static String word(String text) {
        return text.matches("[A-Za-z0-9._/=:+-]+") ? text : "'" + text.replace("'", "'\\''") + "'";
    }
}
