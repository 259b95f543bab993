package settle.engine.schedule;

import java.util.Arrays;

/**
 * The nudges of one arm, in the order they were applied: nudge j multiplies the rate of every update of
 * every epoch ≥ {@code from_j} by {@code factor_j}, so the multiplier in force at epoch e is the product,
 * in log order, of the factors whose {@code from} ≤ e (1 when there are none). Appending is rare (a person
 * typing) and publishes a fresh snapshot; reading allocates nothing, so a driver may consult the log once
 * per epoch from any thread.
 */
public final class NudgeLog {

    /** One applied nudge: from epoch {@code from} on, rates × {@code factor}. */
    public record Entry(int from, double factor, String note) {

        public Entry {
            if (from < 1) {
                throw new IllegalArgumentException("a nudge applies from epoch 1 or later, got " + from);
            }
            if (!(factor > 0) || factor == Double.POSITIVE_INFINITY) {
                throw new IllegalArgumentException("a nudge factor must be positive and finite, got " + factor);
            }
            note = note == null ? "" : note;
        }
    }

    private volatile Entry[] entries = new Entry[0];

    /** An empty log. */
    public NudgeLog() {
    }

    /** @return a log holding {@code initial}, in order */
    public static NudgeLog of(Iterable<Entry> initial) {
        NudgeLog log = new NudgeLog();
        for (Entry e : initial) {
            log.append(e);
        }
        return log;
    }

    /** Appends one nudge. */
    public synchronized void append(Entry entry) {
        Entry[] next = Arrays.copyOf(entries, entries.length + 1);
        next[next.length - 1] = java.util.Objects.requireNonNull(entry, "entry");
        entries = next;
    }

    /** Replaces the whole log by {@code replacement}, in order (a run that starts again from its records). */
    public synchronized void replaceAll(Iterable<Entry> replacement) {
        java.util.List<Entry> list = new java.util.ArrayList<>();
        for (Entry e : replacement) {
            list.add(java.util.Objects.requireNonNull(e, "entry"));
        }
        entries = list.toArray(new Entry[0]);
    }

    /** @return the product, in log order, of the factors of every nudge with from ≤ {@code epoch} */
    public double multiplier(int epoch) {
        Entry[] snapshot = entries;
        double m = 1.0;
        for (Entry e : snapshot) {
            if (e.from() <= epoch) {
                m *= e.factor();
            }
        }
        return m;
    }

    /** @return the nudges applied so far, in order (a fresh array) */
    public Entry[] entries() {
        return entries.clone();
    }

    /** @return how many nudges the log holds */
    public int size() {
        return entries.length;
    }
}
