package settle.engine.model;

import settle.input.BadInputException;

/** The nonlinearity of an MLP's hidden layers (plan key {@code model.activation}). */
public enum Activation {
    /** max(z, 0); its derivative is taken as 0 at z = 0 */
    RELU,
    /** tanh z */
    TANH;

    /** @return the plan spelling: {@code relu} or {@code tanh} */
    public String key() {
        return name().toLowerCase(java.util.Locale.ROOT);
    }

    /**
     * @param text {@code relu} or {@code tanh} (case-insensitive)
     * @throws BadInputException naming {@code model.activation} and the accepted values
     */
    public static Activation parse(String text) {
        if (text != null) {
            for (Activation a : values()) {
                if (a.key().equalsIgnoreCase(text.strip())) {
                    return a;
                }
            }
        }
        throw BadInputException.of("model.activation", "model.activation must be relu or tanh, not "
                + BadInputException.shown(String.valueOf(text)));
    }
}
