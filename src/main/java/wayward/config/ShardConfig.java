package wayward.config;

import java.util.List;

/**
 * Several instances sharing one config: this instance's name and the names of all of them. Each watches the
 * cameras that rendezvous hashing of the camera id over the names gives it ({@code wayward.service.Shards}): over
 * those online by their status on the MQTT broker ({@code wayward.service.Membership}), or over all of them.
 *
 * @param instance  this instance's name ({@code [service] instance} or the environment's WAYWARD_INSTANCE)
 * @param instances every instance's name ({@code [service] instances} or WAYWARD_INSTANCES, comma-separated)
 * @param viaBroker {@code [service] membership = "broker"} (the default with [mqtt]): hash over the instances
 *                  online; false ({@code "fixed"}, or no [mqtt]): over all of them, whatever their state
 */
public record ShardConfig(String instance, List<String> instances, boolean viaBroker) {
    /** {@code [service] membership}: the instances online by their status on the broker share the cameras. */
    public static final String BROKER = "broker";
    /** {@code [service] membership}: the configured instances share the cameras whatever their state. */
    public static final String FIXED = "fixed";

    public ShardConfig {
        instances = List.copyOf(instances);
    }

    /** {@code [service] membership} as written. */
    public String membership() {
        return viaBroker ? BROKER : FIXED;
    }
}
