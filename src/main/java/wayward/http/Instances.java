package wayward.http;

import java.time.Instant;
import java.util.List;

/**
 * Instances sharing the cameras of one config, as this instance sees them: who is online and which instance
 * watches which camera, and why. Immutable; the status server shows it in {@code /api/cameras} and the metrics.
 *
 * @param self            this instance's name
 * @param membership      {@code broker} (the instances online by their status on the broker share the cameras) or
 *                        {@code fixed} (the configured instances share them whatever their state)
 * @param brokerConnected broker membership: connected and subscribed to the statuses (when not, this instance
 *                        keeps the cameras it watches and takes no others)
 * @param instances       every configured instance, in config order
 * @param cameras         every configured camera, in config order, with the instance that watches it
 * @param moves           cameras that changed instance since this instance started, as it saw them
 */
public record Instances(String self, String membership, boolean brokerConnected, List<Peer> instances,
        List<Assignment> cameras, long moves) {
    public Instances {
        instances = List.copyOf(instances);
        cameras = List.copyOf(cameras);
    }

    /**
     * @param name   the instance's name
     * @param online online by its status (this instance: always); null when not known (fixed membership)
     * @param since  when this instance last saw that state change, or null when it never saw one
     */
    public record Peer(String name, Boolean online, Instant since) {
    }

    /**
     * @param camera   the camera's id
     * @param instance the instance that watches it
     * @param reason   why that one, in a few words
     */
    public record Assignment(String camera, String instance, String reason) {
    }
}
