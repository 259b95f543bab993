package settle.experiments.run;

import java.io.PrintStream;
import java.util.Locale;

/**
 * Shows how a run is going on stderr: a bar redrawn in place when stderr is a terminal, a plain line every
 * few seconds otherwise (logs and CI), nothing when quiet; the command chooses the {@link Mode} by the one rule for
 * terminals ({@code settle.experiments.cli.Terminal}). Shows replicates done, updates per second and
 * the time left, estimated from the replicates finished so far.
 */
public final class Progress {

    /** How the progress is shown. */
    public enum Mode { BAR, LINES, QUIET }

    private static final long LINE_INTERVAL_NANOS = 5_000_000_000L;
    private static final long BAR_INTERVAL_NANOS = 200_000_000L;
    private static final int BAR_WIDTH = 30;

    private final PrintStream err;
    private final Mode mode;
    private final int total;
    private final int alreadyDone;
    private final long start;
    private int done;
    private int diverged;
    private long updates;
    private long lastShown;

    /**
     * @param total replicates of the study
     * @param alreadyDone replicates found finished on disk (resume)
     */
    public Progress(PrintStream err, Mode mode, int total, int alreadyDone) {
        this.err = err;
        this.mode = mode;
        this.total = total;
        this.alreadyDone = alreadyDone;
        this.done = alreadyDone;
        this.start = System.nanoTime();
        this.lastShown = start - LINE_INTERVAL_NANOS;
        if (mode != Mode.QUIET && alreadyDone > 0) {
            // a resumed or grown study: say what is kept before the counts start from it
            err.println(String.format(Locale.ROOT, "settle: %d of %d replicates kept from earlier runs; %d to train",
                    alreadyDone, total, total - alreadyDone));
        }
    }

    /** Records a finished replicate and redraws when due. */
    public synchronized void finished(ReplicateOutcome outcome) {
        done++;
        updates += outcome.updates();
        if (outcome.diverged()) {
            diverged++;
        }
        long now = System.nanoTime();
        long interval = mode == Mode.BAR ? BAR_INTERVAL_NANOS : LINE_INTERVAL_NANOS;
        if (done == total || now - lastShown >= interval) {
            lastShown = now;
            show(now);
        }
    }

    /** Ends the display (a newline after a bar). */
    public synchronized void close() {
        if (mode == Mode.BAR) {
            show(System.nanoTime());
            err.println();
        }
    }

    private void show(long now) {
        if (mode == Mode.QUIET) {
            return;
        }
        double seconds = Math.max(1e-9, (now - start) / 1e9);
        int ranHere = done - alreadyDone;
        double rate = updates / seconds;
        String left = ranHere == 0 ? "?" : duration(seconds / ranHere * (total - done));
        String divergedText = diverged == 0 ? "" : String.format(Locale.ROOT, ", %d diverged", diverged);
        String figures = String.format(Locale.ROOT, "%d/%d replicates%s, %s updates/s, %s left",
                done, total, divergedText, compact(rate), left);
        if (mode == Mode.BAR) {
            int filled = total == 0 ? BAR_WIDTH : (int) Math.round(BAR_WIDTH * (double) done / total);
            err.print("\r[" + "#".repeat(filled) + "-".repeat(BAR_WIDTH - filled) + "] " + figures + "   ");
            err.flush();
        } else {
            err.println("settle: " + figures);
        }
    }

    static String compact(double value) {
        if (value >= 1e6) {
            return String.format(Locale.ROOT, "%.1fM", value / 1e6);
        }
        if (value >= 1e3) {
            return String.format(Locale.ROOT, "%.1fk", value / 1e3);
        }
        return String.format(Locale.ROOT, "%.0f", value);
    }

    static String duration(double seconds) {
        long s = Math.round(seconds);
        if (s < 60) {
            return s + "s";
        }
        if (s < 3600) {
            return (s / 60) + "m" + String.format(Locale.ROOT, "%02d", s % 60) + "s";
        }
        return (s / 3600) + "h" + String.format(Locale.ROOT, "%02d", (s % 3600) / 60) + "m";
    }
}
