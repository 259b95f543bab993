package settle.reports.format;

import java.util.List;

/**
 * What {@code manifest.json} records about a study (study directory format 2).
 *
 * @param format the study directory format (2)
 * @param study the study's name (the plan's {@code study})
 * @param toolVersion settle's version that ran the study
 * @param gitCommit the commit settle was built from ("" when unknown)
 * @param jvm the JVM vendor, name and version in one line
 * @param cpu the CPU model, architecture and core count in one line
 * @param executor where the replicates ran
 * @param threads replicates trained at once
 * @param command the command line as typed
 * @param generator the named random generator algorithm
 * @param rootSeed the plan's root seed
 * @param started when the run started (ISO-8601)
 * @param ended when it ended, or "" while running or when killed
 * @param planSha256 SHA-256 of the resolved plan
 * @param dataSha256 SHA-256 of the data
 * @param splitSha256 SHA-256 of the train/test/holdout split
 * @param dataSource the plan's data source
 * @param rows rows of the data
 * @param featureNames the feature names
 * @param classNames the class names, in class order
 * @param trainRows training rows
 * @param testRows test rows
 * @param updatesPerEpoch updates in one epoch
 * @param model the model in words
 * @param parameters the number of parameters
 * @param l2 the model's penalty λ (the plan's {@code model.l2}; 0 for none)
 * @param baseline the baseline arm's name
 * @param arms the arms' names, in arm-index order (index 1 first)
 * @param grids what each grid entry of the plan expanded into, in the plan's order; empty without a grid
 * @param replicates replicates per arm (the largest replicate number listed)
 */
public record Manifest(int format, String study, String toolVersion, String gitCommit, String jvm, String cpu, String executor,
        int threads, List<String> command, String generator, long rootSeed, String started, String ended,
        String planSha256, String dataSha256, String splitSha256, String dataSource, int rows,
        List<String> featureNames, List<String> classNames, int trainRows, int testRows, int updatesPerEpoch,
        String model, int parameters, double l2, String baseline, List<String> arms, List<Grid> grids,
        int replicates) {

    public Manifest {
        command = List.copyOf(command);
        grids = List.copyOf(grids);
        featureNames = List.copyOf(featureNames);
        classNames = List.copyOf(classNames);
        arms = List.copyOf(arms);
        if (arms.isEmpty()) {
            throw new StudyFormatException("manifest.json: 'arms' is empty; a study has at least one arm");
        }
        if (!arms.contains(baseline)) {
            throw new StudyFormatException("manifest.json: the baseline '" + baseline + "' is not one of the arms");
        }
    }

    /** @return the 0-based index of the baseline arm */
    public int baselineIndex() {
        return arms.indexOf(baseline);
    }

    /** @return the number of classes K */
    public int classes() {
        return classNames.size();
    }
}
