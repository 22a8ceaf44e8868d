package wayward.config;

import java.util.List;

/**
 * Several instances sharing one config: this instance's name and the names of all of them. Each watches the
 * cameras that rendezvous hashing of the camera id over the names gives it ({@code wayward.service.Shards}).
 *
 * @param instance  this instance's name ({@code [service] instance} or the environment's WAYWARD_INSTANCE)
 * @param instances every instance's name ({@code [service] instances} or WAYWARD_INSTANCES, comma-separated)
 */
public record ShardConfig(String instance, List<String> instances) {
    public ShardConfig {
        instances = List.copyOf(instances);
    }
}
