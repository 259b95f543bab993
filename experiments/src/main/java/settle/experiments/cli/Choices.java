package settle.experiments.cli;

import java.util.ArrayList;
import java.util.List;
import java.util.function.Function;
import picocli.CommandLine;
import picocli.CommandLine.ITypeConverter;
import picocli.CommandLine.TypeConversionException;
import settle.engine.model.Activation;
import settle.engine.model.ModelSpec;
import settle.engine.text.NearMiss;
import settle.engine.train.Sampling;
import settle.input.BadInputException;

/**
 * The options that take one of a few words ({@code --model}, {@code --activation}, {@code --sampling}) are typed:
 * picocli converts them to the engine's enums by the plan's own words, and a word that is none of them gets one
 * line with the accepted words (and the nearest one), exit 2.
 */
final class Choices {

    private Choices() {
    }

    /** Registers the converters on {@code cl} and its subcommands. */
    static void register(CommandLine cl) {
        cl.registerConverter(ModelSpec.Kind.class, converter(ModelSpec.Kind.values(), ModelSpec.Kind::key));
        cl.registerConverter(Activation.class, converter(Activation.values(), Activation::key));
        cl.registerConverter(Sampling.class, converter(Sampling.values(), Sampling::toString));
    }

    /** @return a converter accepting each value's word, case-insensitively, blanks around it ignored */
    static <E extends Enum<E>> ITypeConverter<E> converter(E[] values, Function<E, String> word) {
        List<String> words = new ArrayList<>();
        for (E v : values) {
            words.add(word.apply(v));
        }
        return text -> {
            for (E v : values) {
                if (word.apply(v).equalsIgnoreCase(text.strip())) {
                    return v;
                }
            }
            throw new TypeConversionException(BadInputException.shown(text) + " is not accepted; expected "
                    + String.join(" or ", words) + NearMiss.suggestion(text, words));
        };
    }
}
