package settle.experiments.cli;

import java.nio.file.Path;

/**
 * Where settle writes when no option says: under {@code studies/} in the current directory, and nowhere else.
 * {@code run} and {@code demo} write a study directory {@code studies/<study>/}, {@code probe} its page
 * {@code studies/<study>-probe.html}, {@code compare} {@code studies/compare.html} and {@code studies/compare.csv}. In a checkout of settle {@code studies/} is git-ignored (at any depth), so
 * running from the checkout leaves the source tree as it was ({@code PlacesTest}).
 */
final class Places {

    /** The folder every default output lands in, relative to the current directory. */
    static final Path STUDIES = Path.of("studies");

    private Places() {
    }

    /** @return the default study directory of the study named {@code study} */
    static Path study(String study) {
        return STUDIES.resolve(study);
    }

    /** The default page of {@code settle compare}; its CSV goes beside it ({@link #besidePage}). */
    static final Path COMPARISON = STUDIES.resolve("compare.html");

    /** @return the CSV beside a page: {@code x.html} gives {@code x.csv}, any other name gets {@code .csv} added */
    static Path besidePage(Path page) {
        String name = page.getFileName().toString();
        String stem = name.endsWith(".html") ? name.substring(0, name.length() - ".html".length()) : name;
        return page.resolveSibling(stem + ".csv");
    }

    /** @return the default page of {@code settle probe} for the study named {@code study} */
    static Path probePage(String study) {
        return STUDIES.resolve(study + "-probe.html");
    }
}
