package settle.reports;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import settle.input.BadInputException;
import settle.reports.compare.CrossStudy;
import settle.reports.compare.StudyDigest;
import settle.reports.format.AtomicFile;
import settle.reports.format.Csv;
import settle.reports.format.StudyReader;
import settle.reports.html.ComparePage;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.Comparison;
import settle.reports.stats.VerdictOptions;
import settle.reports.text.Names;

/**
 * Compares studies: reads each study directory through {@link StudyReader}, analyses it as its own report does
 * ({@link StudyAnalysis}), sets them side by side ({@link CrossStudy}) and writes one page ({@link ComparePage}) and
 * one CSV ({@link #csv}). Nothing is pooled across studies.
 */
public final class Compare {

    /** The CSV's header. */
    public static final List<String> COLUMNS = List.of("study", "directory", "group", "data", "model", "epochs",
            "batch", "sampling", "updates", "replicates", "pairs", "baseline", "primary_metric", "arm", "shared",
            "effect", "unit", "ci_low", "ci_high", "ci_level", "p_adjusted", "outcome", "picked");

    private Compare() {
    }

    /**
     * What was written.
     *
     * @param page the page's path
     * @param table the CSV's path
     * @param comparison the studies side by side
     * @param lines the answer for the terminal, without line ends
     */
    public record Outcome(Path page, Path table, CrossStudy comparison, List<String> lines) {

        public Outcome {
            lines = List.copyOf(lines);
        }

        /** @return lines naming the studies with missing or diverged replicates (empty when none) */
        public List<String> incomplete() {
            List<String> out = new ArrayList<>();
            for (int s = 0; s < comparison.studies().size(); s++) {
                StudyDigest d = comparison.studies().get(s);
                int planned = d.replicates() * (d.arms().size() + 1);
                if (d.missing() > 0) {
                    out.add(d.directory() + ": partial study: " + d.missing() + " of " + planned
                            + " replicates missing (its verdict pairs the " + d.pairs() + " indices present in every arm)");
                }
                if (d.diverged() > 0) {
                    out.add(d.directory() + ": " + d.diverged() + " of " + planned + " replicates diverged");
                }
            }
            return out;
        }
    }

    /**
     * Reads and digests the studies, refusing bad input before anything is written.
     *
     * @param directories the study directories, two or more, each once
     * @return them side by side
     * @throws BadInputException for fewer than two studies, one given twice, or a missing or invalid study directory
     *     (naming it)
     * @throws IOException when a file cannot be read
     */
    public static CrossStudy read(List<Path> directories) throws IOException {
        if (directories.size() < 2) {
            throw BadInputException.of("STUDY_DIR", directories.isEmpty() ? "no study directory given; compare needs"
                    + " two or more" : "only one study directory given (" + BadInputException.shown(
                            directories.get(0).toString()) + "); compare needs two or more");
        }
        Map<Path, Path> seen = new HashMap<>();
        for (Path d : directories) {
            if (!Files.isDirectory(d)) {
                StudyReader.read(d); // refuses it with the reader's own line: no such study directory, or a file
            }
            Path real = d.toRealPath();
            Path before = seen.putIfAbsent(real, d);
            if (before != null) {
                throw BadInputException.inFile(d.toString(), "", "given twice (also as " + before
                        + "); give each study once");
            }
        }
        List<StudyDigest> digests = new ArrayList<>();
        for (Path d : directories) {
            StudyDigest digest = StudyDigest.of(StudyAnalysis.of(StudyReader.read(d), VerdictOptions.defaults()));
            for (StudyDigest other : digests) {
                if (other.planSha256().equals(digest.planSha256()) && other.dataSha256().equals(digest.dataSha256())) {
                    throw BadInputException.inFile(d.toString(), "", "the same study as " + other.directory()
                            + " (the same resolved plan and data, so the same results); give each study once");
                }
            }
            digests.add(digest);
        }
        return CrossStudy.of(digests);
    }

    /**
     * Reads the studies and writes the page and the CSV atomically.
     *
     * @param directories the study directories
     * @param page where the page goes
     * @param table where the CSV goes
     * @return what was written
     * @throws BadInputException as {@link #read}; nothing is written then
     * @throws IOException when a file cannot be read or written
     */
    public static Outcome write(List<Path> directories, Path page, Path table) throws IOException {
        CrossStudy c = read(directories);
        AtomicFile.write(table, csv(c));
        AtomicFile.write(page, ComparePage.render(c));
        return new Outcome(page, table, c, lines(c));
    }

    /**
     * The CSV: RFC 4180 through {@link Csv} (text cells guarded against spreadsheet formulas), one row per study and
     * arm other than its baseline (a study with the baseline alone gets one row with the arm's cells empty), the study's
     * facts repeated on each row. {@code group} numbers the groups from 1 (studies with the same baseline and primary
     * metric); {@code shared} is true for an arm present in two or more studies of its group; {@code effect},
     * {@code ci_low}, {@code ci_high} are % changes of the primary metric against the study's baseline (its verdict's
     * Hodges–Lehmann estimate and exact interval at {@code ci_level}), {@code p_adjusted} its Bonferroni-adjusted p
     * within the study; {@code outcome} is lower, higher, same, no-difference, unclear or not-compared.
     *
     * @param c the studies side by side
     * @return the file's text
     */
    public static String csv(CrossStudy c) {
        StringBuilder b = new StringBuilder();
        b.append(Csv.line(COLUMNS.toArray(String[]::new)));
        for (int s = 0; s < c.studies().size(); s++) {
            StudyDigest d = c.studies().get(s);
            int group = 0;
            CrossStudy.Group g = null;
            for (int i = 0; i < c.groups().size(); i++) {
                if (c.groups().get(i).studies().contains(s)) {
                    group = i + 1;
                    g = c.groups().get(i);
                }
            }
            List<String> facts = List.of(Csv.text(c.labels().get(s)), Csv.text(d.directory().toString()),
                    Integer.toString(group), Csv.text(d.dataSource()), Csv.text(d.model()), Integer.toString(d.epochs()),
                    Integer.toString(d.batch()), Csv.text(d.sampling()), Long.toString(d.updates()),
                    Integer.toString(d.replicates()), Integer.toString(d.pairs()), Csv.text(d.baseline()),
                    d.primary().key());
            if (d.arms().isEmpty()) {
                List<String> cells = new ArrayList<>(facts);
                for (int i = facts.size(); i < COLUMNS.size(); i++) {
                    cells.add("");
                }
                b.append(Csv.line(cells.toArray(String[]::new)));
            }
            for (StudyDigest.ArmEffect a : d.arms()) {
                List<String> cells = new ArrayList<>(facts);
                final CrossStudy.Group group0 = g;
                boolean shared = group0 != null && group0.arms().stream().anyMatch(x -> x.name().equals(a.name()));
                Comparison k = a.comparison();
                boolean effect = k != null && k.effectPairs() > 0;
                boolean exact = effect && k.exact().isDefined();
                cells.add(Csv.text(a.name()));
                cells.add(Boolean.toString(shared));
                cells.add(effect ? Csv.number(k.change()) : "");
                cells.add(k == null ? "" : k.scale().unit());
                cells.add(exact ? Csv.number(k.scale().shown(k.exact().low())) : "");
                cells.add(exact ? Csv.number(k.scale().shown(k.exact().high())) : "");
                cells.add(k == null ? "" : Csv.number(k.level()));
                cells.add(k == null ? "" : Csv.number(k.pAdjusted()));
                cells.add(a.outcome().name().toLowerCase(Locale.ROOT).replace('_', '-'));
                cells.add(Boolean.toString(a.picked()));
                b.append(Csv.line(cells.toArray(String[]::new)));
            }
        }
        return b.toString();
    }

    /**
     * The answer for the terminal: per group a heading, per shared arm its summary sentence and a line of its effect
     * in each study (the page's right-hand column), and each study's pick.
     *
     * @param c the studies side by side
     * @return the lines, without line ends
     */
    public static List<String> lines(CrossStudy c) {
        List<String> out = new ArrayList<>();
        for (CrossStudy.Group g : c.groups()) {
            out.add((g.why().isEmpty() ? "" : "kept apart: ") + g.studies().size() + " stud" + (g.studies().size() == 1
                    ? "y" : "ies") + " (" + g.primary().words() + " of the returned iterate against the baseline "
                    + Names.shown(g.baseline()) + "; each study's own verdict, nothing pooled):");
            if (!g.why().isEmpty()) {
                out.add("  " + g.why());
            }
            if (g.arms().isEmpty()) {
                out.add("  no arm other than the baseline is in two of these studies: nothing to set side by side");
            }
            for (CrossStudy.SharedArm a : g.arms()) {
                out.add("  " + a.sentence());
                List<String> effects = new ArrayList<>();
                for (CrossStudy.Row row : a.rows()) {
                    effects.add(Names.shown(c.labels().get(row.study())) + " " + ComparePage.effectText(
                            row.effect().comparison()));
                }
                out.add("    " + String.join("; ", effects));
            }
            List<String> picks = new ArrayList<>();
            for (int s : g.studies()) {
                StudyDigest d = c.studies().get(s);
                picks.add(Names.shown(c.labels().get(s)) + ": " + (d.pick() == null ? "none" : Names.shown(d.pick())));
            }
            out.add("  picks: " + String.join("; ", picks));
        }
        return out;
    }
}
