package settle.experiments.cli;

/**
 * Whether a standard stream is an interactive terminal: the one rule behind every display that redraws in place
 * ({@code run}'s progress bar on stderr, {@code follow}'s view on stdout). A display redraws only when the stream it
 * is drawn on is a terminal; otherwise it prints plain lines, so {@code 2>log} or {@code >log} on a terminal fills
 * no log with carriage returns or screen clears.
 *
 * <p>Java cannot ask this of one stream: {@link System#console()} looks at stdin and stdout together. The launcher
 * ({@code ./settle}) asks the shell ({@code [ -t 1 ]}, {@code [ -t 2 ]}) and passes the answers as
 * {@code -Dsettle.stdout=terminal|file} and {@code -Dsettle.stderr=terminal|file}. Without them ({@code java -jar}
 * by hand) the console check decides, which is right for stdout and a guess for stderr.
 */
enum Terminal {

    /** Standard output. */
    STDOUT("settle.stdout"),
    /** Standard error. */
    STDERR("settle.stderr");

    private final String property;

    Terminal(String property) {
        this.property = property;
    }

    /** @return the system property the launcher sets for this stream */
    String property() {
        return property;
    }

    /** @return true when this stream is an interactive terminal, as the launcher says (else the console check) */
    boolean isTerminal() {
        return decide(System.getProperty(property), System.console() != null);
    }

    /**
     * @param launcherWord {@code terminal}, {@code file}, or null when the launcher said nothing
     * @param console whether {@link System#console()} is there (stdin and stdout both terminals)
     * @return the launcher's word when it gave one, else the console check
     */
    static boolean decide(String launcherWord, boolean console) {
        if ("terminal".equals(launcherWord)) {
            return true;
        }
        if ("file".equals(launcherWord)) {
            return false;
        }
        return console;
    }
}
