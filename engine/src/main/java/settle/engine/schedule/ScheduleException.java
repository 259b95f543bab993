package settle.engine.schedule;

/**
 * A schedule map that cannot be accepted: an unknown kind or key, a missing key, or a value outside its
 * accepted range. The message is one line naming the key, the value and what would be accepted, e.g.
 * {@code reciprocal: decay = -1 is not accepted; expected a finite number > 0}.
 */
public final class ScheduleException extends IllegalArgumentException {

    private static final long serialVersionUID = 1L;

    private final String key;

    /**
     * @param key the key path inside the schedule map ({@code decay}, {@code warmup.epochs},
     *     {@code points[2]}); {@code kind} for an unknown or missing kind
     * @param message the whole one-line message
     */
    public ScheduleException(String key, String message) {
        super(message);
        this.key = key;
    }

    /** @return the key path inside the schedule map, e.g. {@code decay}, {@code warmup.epochs}, {@code points[2]} */
    public String key() {
        return key;
    }
}
