package settle.experiments.cli;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import settle.experiments.manual.ProgressBoard;
import settle.experiments.study.StudyLock;
import settle.input.BadInputException;

/**
 * {@code settle follow STUDY}: shows a run's {@code progress.json} live: each arm's state, and for manual
 * arms the epoch, its rate, the next epoch's rate and the median [first quartile, third quartile] over the
 * replicates of the training objective, the test loss and (convex models) the distance to θ*. When stdout is a
 * terminal ({@link Terminal}, the rule of {@code run}'s progress bar) the view is redrawn in place whenever the file
 * changes; otherwise one plain line is printed per change.
 * It ends when the run ends (exit 0), or when no live run is left to update it (exit 1).
 */
@Command(name = "follow", mixinStandardHelpOptions = true,
        description = "Follow a running study live (manual arms especially); ends when the run ends.")
public final class FollowCommand implements Callable<Integer> {

    private static final ObjectMapper MAPPER = new ObjectMapper();
    /** How long follow waits for a starting run to write progress.json. */
    private static final long START_WAIT_MILLIS = 10_000;

    @Parameters(index = "0", paramLabel = "STUDY", description = "the study directory")
    Path study;

    @Option(names = "--interval", paramLabel = "MS", description = "how often to look for changes (default ${DEFAULT-VALUE} ms)")
    long interval = 250;

    @Option(names = "--plain", description = "plain lines even in a terminal")
    boolean plain;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() throws IOException, InterruptedException {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        if (interval < 10 || interval > 60_000) {
            throw BadInputException.of("--interval", "--interval must be between 10 and 60000 ms, got " + interval);
        }
        boolean terminal = !plain && Terminal.STDOUT.isTerminal();
        Path file = study.resolve(ProgressBoard.FILE);
        Map<Integer, String> shown = new HashMap<>();
        String last = null;
        long waitedSince = System.currentTimeMillis();
        try {
            while (true) {
                String text;
                try {
                    text = Files.readString(file, StandardCharsets.UTF_8);
                } catch (NoSuchFileException e) {
                    if (!Files.isDirectory(study)) {
                        throw BadInputException.inFile(study.toString(), "", (Files.exists(study) ? "a file" : "no such"
                                + " directory") + "; give a study directory");
                    }
                    if (!StudyLock.heldByLiveProcess(study)
                            && System.currentTimeMillis() - waitedSince > START_WAIT_MILLIS) {
                        throw BadInputException.inFile(study.toString(), "", "no " + ProgressBoard.FILE
                                + " and no live run; start one with settle run PLAN --out " + study);
                    }
                    Thread.sleep(interval);
                    continue;
                }
                JsonNode p;
                try {
                    p = MAPPER.readTree(text);
                } catch (IOException e) {
                    throw BadInputException.inFile(file.toString(), "", "not a progress file settle wrote (not valid"
                            + " JSON)");
                }
                if (!text.equals(last)) {
                    last = text;
                    if (terminal) {
                        out.print("\033[H\033[2J");
                        for (String line : view(p)) {
                            out.println(line);
                        }
                    } else {
                        for (String line : changes(p, shown)) {
                            out.println(line);
                        }
                    }
                    out.flush();
                }
                if (!p.path("running").asBoolean()) {
                    out.println("study " + p.path("study").asText() + ": the run has ended");
                    return Main.OK;
                }
                if (!StudyLock.heldByLiveProcess(study)) {
                    // the file may have been rewritten by the ending run just now: look once more
                    String again = Files.readString(file, StandardCharsets.UTF_8);
                    if (!again.equals(text)) {
                        continue;
                    }
                    err.println("settle follow: the run of " + study + " stopped before it ended (no live process"
                            + " holds " + StudyLock.FILE + "); run the same command again to resume it");
                    return Main.FAILED;
                }
                Thread.sleep(interval);
            }
        } catch (IOException e) {
            throw new IOException("cannot read " + file + ": " + e.getMessage(), e);
        }
    }

    /** @return the whole view of a progress document, a few lines per arm */
    static List<String> view(JsonNode p) {
        List<String> lines = new ArrayList<>();
        lines.add("study " + p.path("study").asText() + " · " + (p.path("running").asBoolean() ? "running" : "ended")
                + " · updated " + p.path("updated").asText());
        lines.add("values: median [first quartile, third quartile] over the replicates at the epoch shown");
        int epochs = p.path("epochs").asInt();
        for (JsonNode a : p.path("arms")) {
            String head = String.format(Locale.ROOT, "  #%-3d %s%s  %s  %d/%d replicates written%s",
                    a.path("index").asInt(), a.path("name").asText(), a.path("manual").asBoolean() ? " (manual)" : "",
                    a.path("state").asText(), a.path("finished").asInt(), a.path("replicates").asInt(),
                    a.path("diverged").asInt() > 0 ? ", " + a.path("diverged").asInt() + " diverged" : "");
            lines.add(head);
            if (a.path("manual").asBoolean() && a.path("epoch").asInt() > 0) {
                lines.add("       " + manualLine(a, epochs));
            }
        }
        return lines;
    }

    /** @return the lines for what changed since {@code shown} (arm index → last line printed); updates it */
    static List<String> changes(JsonNode p, Map<Integer, String> shown) {
        List<String> lines = new ArrayList<>();
        int epochs = p.path("epochs").asInt();
        for (JsonNode a : p.path("arms")) {
            int index = a.path("index").asInt();
            String line;
            if (a.path("manual").asBoolean() && a.path("epoch").asInt() > 0) {
                line = String.format(Locale.ROOT, "#%d %s: %s", index, a.path("name").asText(), manualLine(a, epochs));
                if (!a.path("state").asText().equals("running")) {
                    line += "; " + a.path("state").asText();
                }
            } else {
                line = String.format(Locale.ROOT, "#%d %s: %s, %d/%d replicates written", index, a.path("name").asText(),
                        a.path("state").asText(), a.path("finished").asInt(), a.path("replicates").asInt());
            }
            if (!line.equals(shown.get(index))) {
                shown.put(index, line);
                lines.add(line);
            }
        }
        return lines;
    }

    private static String manualLine(JsonNode a, int epochs) {
        StringBuilder b = new StringBuilder(String.format(Locale.ROOT, "epoch %d/%d  rate %s", a.path("epoch").asInt(),
                epochs, number(a.path("rate"))));
        if (!a.path("next_rate").isNull() && !a.path("next_rate").isMissingNode()) {
            b.append("  next ").append(number(a.path("next_rate")));
        }
        b.append("  nudges ").append(a.path("nudges").asInt());
        b.append("  objective ").append(spread(a.path("objective")));
        b.append("  test loss ").append(spread(a.path("test_loss")));
        if (!a.path("distance").isNull()) {
            b.append("  distance to θ* ").append(spread(a.path("distance")));
        }
        return b.toString();
    }

    private static String spread(JsonNode s) {
        if (s.isNull() || s.isMissingNode()) {
            return "—";
        }
        return number(s.path("median")) + " [" + number(s.path("q1")) + ", " + number(s.path("q3")) + "]";
    }

    private static String number(JsonNode v) {
        return v.isNumber() ? String.format(Locale.ROOT, "%.4g", v.asDouble()) : "—";
    }
}
