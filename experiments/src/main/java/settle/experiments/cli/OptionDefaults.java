package settle.experiments.cli;

import picocli.CommandLine.IDefaultValueProvider;
import picocli.CommandLine.Model.ArgSpec;
import picocli.CommandLine.Model.OptionSpec;
import settle.experiments.plan.Defaults;

/** picocli reads the default of an option that stands for a plan key from the one table, {@link Defaults}. */
final class OptionDefaults implements IDefaultValueProvider {

    @Override
    public String defaultValue(ArgSpec argument) {
        return argument instanceof OptionSpec option ? Defaults.option(option.longestName()) : null;
    }
}
