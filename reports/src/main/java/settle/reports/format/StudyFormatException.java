package settle.reports.format;

/**
 * A study directory that is missing, or a file in it that does not follow the study directory format: the
 * message is one line naming the file (and key) and what would be accepted.
 */
public final class StudyFormatException extends IllegalArgumentException {

    private static final long serialVersionUID = 1L;

    /** @param message one line naming the file, key and what is accepted */
    public StudyFormatException(String message) {
        super(message);
    }
}
