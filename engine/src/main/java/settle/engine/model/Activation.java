package settle.engine.model;


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
}
