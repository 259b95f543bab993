package settle.experiments.run;

/**
 * The work failed for a reason outside settle and outside its input: a cluster job whose tasks failed every attempt.
 * The command line maps it to exit code 1 with its one-line message (no stack trace); what was written is kept.
 */
public final class WorkFailedException extends RuntimeException {

    private static final long serialVersionUID = 1L;

    /**
     * @param message one line saying what failed and what is kept
     * @param cause the failure underneath (kept for debugging)
     */
    public WorkFailedException(String message, Throwable cause) {
        super(message, cause);
    }
}
