package settle.reports.format;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import settle.input.BadInputException;

/**
 * The study directory's names and version: the contract between the runner ({@code experiments}) and the report
 * (README, "Study directory"). The files' contents are spelled by one codec each in this package
 * ({@link ManifestJson}, {@link ReferenceJson}, {@link EncodingJson}, {@link ReplicateJson}, {@link NudgesCsv}, {@link EpochsCsv},
 * {@link SummaryCsv}); nothing outside it names a key of them.
 */
public final class StudyFormat {

    /** The study directory format this settle writes and reads. */
    public static final int VERSION = 4;

    /** The resolved plan. */
    public static final String PLAN = "plan.yaml";
    /** Provenance and each replicate's status. */
    public static final String MANIFEST = "manifest.json";
    /** θ* and its curvature (convex models). */
    public static final String REFERENCE = "reference.json";
    /** How the data's columns became the model's inputs, and the test split's labels. */
    public static final String ENCODING = "encoding.json";
    /** The directory of the replicate files, one subdirectory per arm ({@link #armId}). */
    public static final String ARMS = "arms";
    /** Where the directory of an arm removed from the plan is moved, kept (an arm put back is moved back). */
    public static final String RETIRED = "retired";
    /** How many hexadecimal digits of the SHA-256 of an arm's specification its id ends with. */
    public static final int ARM_HASH_DIGITS = 12;
    /** At most this many characters of an arm's name start its id. */
    private static final int ARM_NAME_CHARACTERS = 40;
    /** Every replicate's per-epoch records. */
    public static final String EPOCHS = "epochs.csv";
    /** The report. */
    public static final String REPORT = "report.html";
    /** The report's machine-readable summary. */
    public static final String SUMMARY = "summary.csv";
    /** Manual arms: every nudge applied. */
    public static final String NUDGES = "nudges.csv";
    /** Manual arms: the plan that replays the nudges applied. */
    public static final String REPLAY = "replay.yaml";
    /** Live state of a running study for {@code settle follow}. */
    public static final String PROGRESS = "progress.json";
    /** Manual arms: the queue of nudge requests. */
    public static final String NUDGE_QUEUE = ".nudge";
    /** Held by a live run. */
    public static final String LOCK = ".lock";

    /** What a replicate file set aside as invalid is renamed to: {@code <k>.json.quarantined-<n>}. */
    public static final String QUARANTINED = ".quarantined-";

    private StudyFormat() {
    }

    /**
     * An arm's id, the name of its directory under {@code arms/}: its name made safe for a file name (every
     * character other than an ASCII letter, digit, {@code -}, {@code _} or a {@code .} not at the start becomes
     * {@code _}; cut to 40 characters; {@code arm} when empty), a {@code -}, and the first 12 hexadecimal digits of
     * the SHA-256 of the arm's specification as the resolved plan writes it. Two arms with the same name and
     * specification are the same arm wherever they stand in the plan.
     *
     * @param name the arm's name
     * @param specificationSha256 the lower-case hexadecimal SHA-256 of the arm's canonical specification
     * @return the id
     */
    public static String armId(String name, String specificationSha256) {
        if (specificationSha256.length() < ARM_HASH_DIGITS) {
            throw new IllegalArgumentException("not a SHA-256 in hexadecimal: " + specificationSha256);
        }
        StringBuilder b = new StringBuilder();
        for (int i = 0; i < name.length() && b.length() < ARM_NAME_CHARACTERS; i++) {
            char c = name.charAt(i);
            boolean safe = c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '-'
                    || c == '_' || c == '.' && b.length() > 0;
            b.append(safe ? c : '_');
        }
        if (b.length() == 0) {
            b.append("arm");
        }
        return b.append('-').append(specificationSha256, 0, ARM_HASH_DIGITS).toString();
    }

    /** @return true when {@code name} has the form of an {@link #armId} (names only; nothing is read) */
    public static boolean isArmId(String name) {
        return name.matches("[A-Za-z0-9_\\-][A-Za-z0-9_.\\-]{0,39}-[0-9a-f]{12}");
    }

    /** @return the replicate file of replicate {@code k} (from 1) of the arm with id {@code armId}, relative to the study */
    public static String replicatePath(String armId, int k) {
        return ARMS + "/" + armId + "/" + k + ".json";
    }

    /** @return the replicate file of replicate {@code k} of the arm {@code armId} in study directory {@code directory} */
    public static Path replicateFile(Path directory, String armId, int k) {
        return armDirectory(directory, armId).resolve(k + ".json");
    }

    /** @return the binary file of replicate {@code k} (its large arrays) beside {@link #replicateFile} */
    public static Path binaryFile(Path directory, String armId, int k) {
        return binaryFileOf(replicateFile(directory, armId, k));
    }

    /** @return the binary file beside a replicate's JSON file {@code <k>.json}: {@code <k>.bin} */
    public static Path binaryFileOf(Path replicateJson) {
        String name = replicateJson.getFileName().toString();
        return replicateJson.resolveSibling((name.endsWith(".json") ? name.substring(0, name.length() - 5) : name)
                + BINARY_SUFFIX);
    }

    /** The suffix of a replicate's binary file. */
    public static final String BINARY_SUFFIX = ".bin";

    /** @return the directory of the replicate files of the arm {@code armId} */
    public static Path armDirectory(Path directory, String armId) {
        return directory.resolve(ARMS).resolve(armId);
    }

    /** @return where the directory of the arm {@code armId} is kept while the arm is not in the plan */
    public static Path retiredDirectory(Path directory, String armId) {
        return directory.resolve(RETIRED).resolve(armId);
    }

    /**
     * Moves an invalid replicate file aside, never deleting it: it is renamed to
     * {@code <name>.quarantined-<n>} with the first n from 1 not yet taken, beside where it was.
     *
     * @return the new path
     */
    public static Path quarantine(Path file) throws IOException {
        for (int n = 1;; n++) {
            Path aside = file.resolveSibling(file.getFileName() + QUARANTINED + n);
            if (!Files.exists(aside)) {
                return Files.move(file, aside, StandardCopyOption.ATOMIC_MOVE);
            }
        }
    }

    /**
     * The one-line refusal of a file written in an older format: format 1's tail radius and distance came from the
     * snapshots and its reshuffling prediction was approximate, so its numbers cannot stand beside today's; format
     * 2 wrote every array of a replicate as JSON text; format 3 wrote them as float64 in its binary file and named
     * each arm's directory by its position in the plan, so a plan that gained, lost or reordered arms could not keep
     * its replicates.
     *
     * @param file the manifest (or the file) in the older format
     * @param format the format it records
     * @param rerun the command that rewrites the study, e.g. {@code settle run plan.yaml --out DIR --fresh}
     * @return the refusal, naming the file
     */
    public static BadInputException olderFormat(Path file, int format, String rerun) {
        String what = file.getFileName() != null && file.getFileName().toString().equals(MANIFEST)
                ? "this study directory" : "this file";
        String why = switch (format) {
            case 3 -> " whose arm directories are named by the arms' positions in the plan and whose binary files"
                    + " hold every array as float64 (format 4 names each arm's directory by its specification, so"
                    + " that a study can grow, and codes the arrays compactly, about half the bytes)";
            case 2 -> " whose replicate files hold every array as JSON text (format 4 keeps the large arrays in a"
                    + " compact binary file beside each, a fifth of the bytes)";
            default -> " whose tail metrics came from snapshots and whose reshuffling prediction was approximate";
        };
        return BadInputException.inFile(file.toString(), "", what + " is in format " + format + ", written by an"
                + " earlier settle" + why + "; rerun it with `" + rerun + "` to rewrite it in format " + VERSION);
    }

    /** @return the command that rewrites a study directory from its own plan */
    public static String rerun(Path directory) {
        return "settle run " + directory.resolve(PLAN) + " --out " + directory + " --fresh";
    }

    /**
     * What to do about a damaged {@code encoding.json}: the file is made from the plan and the data alone, so deleting
     * it loses nothing, and the next run writes it again (a run reads it to check the encoding has not changed, so it
     * must go first).
     *
     * @param directory the study directory
     * @return the remedy, to follow the problem after "; "
     */
    public static String encodingRemedy(Path directory) {
        return "it is made from the plan and the data: delete it, and " + rewrites(directory);
    }

    /**
     * @param directory the study directory
     * @param problem the refusal of its {@code encoding.json}
     * @return the same refusal with {@link #encodingRemedy} after it
     */
    public static BadInputException damagedEncoding(Path directory, BadInputException problem) {
        return withRemedy(problem, encodingRemedy(directory));
    }

    /**
     * What to do about a damaged or missing {@code reference.json}: θ* and its curvature are computed from the plan and
     * the data alone, deterministically, and every run writes the file again before it trains (it never reads it), so
     * the next run makes it whole and trains nothing it has.
     *
     * @param directory the study directory
     * @return the remedy, to follow the problem after "; "
     */
    public static String referenceRemedy(Path directory) {
        return "it is computed from the plan and the data: " + rewrites(directory);
    }

    /**
     * @param directory the study directory
     * @param problem the refusal of its {@code reference.json}
     * @return the same refusal with {@link #referenceRemedy} after it
     */
    public static BadInputException damagedReference(Path directory, BadInputException problem) {
        return withRemedy(problem, referenceRemedy(directory));
    }

    /** @return "settle run PLAN --out DIR writes it again, keeping the finished replicates" */
    private static String rewrites(Path directory) {
        return "settle run " + directory.resolve(PLAN) + " --out " + directory + " writes it again, keeping the"
                + " finished replicates";
    }

    private static BadInputException withRemedy(BadInputException problem, String remedy) {
        return BadInputException.at(problem.file(), problem.line(), problem.column(), problem.key(), problem.detail()
                + "; " + remedy);
    }
}
