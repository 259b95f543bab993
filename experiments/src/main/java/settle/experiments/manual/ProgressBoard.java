package settle.experiments.manual;

import com.fasterxml.jackson.core.JsonGenerator;
import java.io.IOException;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import settle.experiments.plan.ArmPlan;
import settle.experiments.plan.Plan;
import settle.reports.format.AtomicFile;
import settle.reports.format.JsonOut;
import settle.reports.format.StudyFormat;
import settle.reports.stats.Quantiles;

/**
 * The live state of a run, {@code progress.json} in the study directory, rewritten atomically whenever it
 * changes (each epoch end of a manual arm, each finished replicate, the start and the end of the run).
 * {@code settle follow} draws it and {@code settle nudge} reads the arms' states from it. Thread-safe.
 */
public final class ProgressBoard {

    /** The file name in a study directory. */
    public static final String FILE = StudyFormat.PROGRESS;

    /** What an arm is doing. */
    public enum State {
        /** no replicate of it has started in this run */
        PENDING,
        /** its replicates are training */
        RUNNING,
        /** every replicate of it is written */
        FINISHED;

        /** @return the word written in progress.json */
        public String word() {
            return name().toLowerCase(java.util.Locale.ROOT);
        }
    }

    /** Median and quartiles (type 7) of one quantity over the replicates that reached an epoch. */
    public record Quartiles(double median, double q1, double q3) {

        /** @return the spread of the finite values among the first {@code count} of {@code values} (not modified), or null when none */
        public static Quartiles of(double[] values, int count) {
            double[] finite = new double[count];
            int n = 0;
            for (int i = 0; i < count; i++) {
                if (Double.isFinite(values[i])) {
                    finite[n++] = values[i];
                }
            }
            if (n == 0) {
                return null;
            }
            double[] sorted = Quantiles.sortedCopy(java.util.Arrays.copyOf(finite, n));
            return new Quartiles(Quantiles.type7(sorted, 0.5), Quantiles.type7(sorted, 0.25), Quantiles.type7(sorted, 0.75));
        }
    }

    /** One arm's line on the board. */
    private static final class Arm {
        final int index;
        final String name;
        final boolean manual;
        final int replicates;
        State state = State.PENDING;
        int finished;
        int diverged;
        int epoch;
        double rate = Double.NaN;
        double nextRate = Double.NaN;
        int nudges;
        Quartiles objective;
        Quartiles testLoss;
        Quartiles distance;

        Arm(int index, String name, boolean manual, int replicates) {
            this.index = index;
            this.name = name;
            this.manual = manual;
            this.replicates = replicates;
        }
    }

    private final Path directory;
    private final String study;
    private final int epochs;
    private final String started;
    private final List<Arm> arms = new ArrayList<>();
    private boolean running = true;

    /** A board for {@code plan}'s arms, every arm pending. */
    public ProgressBoard(Path directory, Plan plan) {
        this.directory = directory;
        this.study = plan.study();
        this.epochs = plan.training().epochs();
        this.started = Instant.now().toString();
        for (int i = 0; i < plan.arms().size(); i++) {
            ArmPlan a = plan.arms().get(i);
            arms.add(new Arm(i + 1, a.name(), a.manual(), plan.replicates()));
        }
    }

    /** Sets an arm's state and its count of replicates already written. */
    public synchronized void state(int arm, State state, int finished, int diverged) {
        Arm a = arms.get(arm - 1);
        a.state = state;
        a.finished = finished;
        a.diverged = diverged;
    }

    /** Counts one more written replicate of {@code arm}. */
    public synchronized void replicateWritten(int arm, boolean diverged) {
        Arm a = arms.get(arm - 1);
        a.finished++;
        if (diverged) {
            a.diverged++;
        }
        if (a.state == State.PENDING) {
            a.state = State.RUNNING;
        }
        if (a.finished >= a.replicates) {
            a.state = State.FINISHED;
        }
    }

    /** Records a manual arm's epoch end: the epoch, its rate, the next epoch's first rate and the spreads. */
    public synchronized void epoch(int arm, int epoch, double rate, double nextRate, int nudges, Quartiles objective,
            Quartiles testLoss, Quartiles distance) {
        Arm a = arms.get(arm - 1);
        if (a.state == State.PENDING) {
            a.state = State.RUNNING;
        }
        a.epoch = epoch;
        a.rate = rate;
        a.nextRate = nextRate;
        a.nudges = nudges;
        a.objective = objective;
        a.testLoss = testLoss;
        a.distance = distance;
    }

    /** Marks the run ended (follow stops). */
    public synchronized void ended() {
        running = false;
    }

    /** Writes {@code progress.json} atomically. */
    public synchronized void write() throws IOException {
        byte[] bytes = JsonOut.document(g -> {
            g.writeStartObject();
            g.writeNumberField("format", 1);
            g.writeStringField("study", study);
            g.writeBooleanField("running", running);
            g.writeNumberField("pid", ProcessHandle.current().pid());
            g.writeStringField("started", started);
            g.writeStringField("updated", Instant.now().toString());
            g.writeNumberField("epochs", epochs);
            g.writeArrayFieldStart("arms");
            for (Arm a : arms) {
                g.writeStartObject();
                g.writeNumberField("index", a.index);
                g.writeStringField("name", a.name);
                g.writeBooleanField("manual", a.manual);
                g.writeStringField("state", a.state.word());
                g.writeNumberField("replicates", a.replicates);
                g.writeNumberField("finished", a.finished);
                g.writeNumberField("diverged", a.diverged);
                if (a.manual) {
                    g.writeNumberField("epoch", a.epoch);
                    JsonOut.number(g, "rate", a.rate);
                    JsonOut.number(g, "next_rate", a.nextRate);
                    g.writeNumberField("nudges", a.nudges);
                    spread(g, "objective", a.objective);
                    spread(g, "test_loss", a.testLoss);
                    spread(g, "distance", a.distance);
                }
                g.writeEndObject();
            }
            g.writeEndArray();
            g.writeEndObject();
        });
        AtomicFile.write(directory.resolve(FILE), bytes);
    }

    private static void spread(JsonGenerator g, String key, Quartiles s) throws IOException {
        g.writeFieldName(key);
        if (s == null) {
            g.writeNull();
            return;
        }
        g.writeStartObject();
        JsonOut.number(g, "median", s.median());
        JsonOut.number(g, "q1", s.q1());
        JsonOut.number(g, "q3", s.q3());
        g.writeEndObject();
    }
}
