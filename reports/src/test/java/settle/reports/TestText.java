package settle.reports;

/** Text helpers for tests that compare the report's sentences word for word. */
final class TestText {

    private TestText() {
    }

    /**
     * @return {@code s} without the U+2068 … U+2069 isolates that wrap a right-to-left arm name the report shows
     *     ({@link settle.reports.text.Names}); they are invisible, so a sentence reads the same without them
     */
    static String plain(String s) {
        return s.replace("\u2068", "").replace("\u2069", "");
    }
}
