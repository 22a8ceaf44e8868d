package wayward.http;

import java.time.Duration;
import java.time.Instant;
import java.util.List;

/**
 * Muting zones and cameras, as the status server's {@code POST /api/mutes} and {@code POST /api/mutes/end} (and the
 * MQTT command topics) ask for it. The service implements it; every change is an event phase of its own.
 */
public interface MuteControl {
    /** A request that cannot be carried out; the message says why, in one line (HTTP 422). */
    final class Refused extends Exception {
        private static final long serialVersionUID = 1L;

        public Refused(String message) {
            super(message);
        }
    }

    /** Mutes {@code zone} of {@code camera} (null zone: the whole camera) until {@code until}. */
    MuteState mute(String camera, String zone, Instant until, String by, String reason) throws Refused;

    /** Ends a mute before its time. */
    MuteState unmute(String camera, String zone, String by, String reason) throws Refused;

    /** The mutes in force, cameras in config order. */
    List<MuteState> mutes();

    /** The longest a mute may last ({@code [service] max_mute_hours}). */
    Duration longest();

    /** Runs {@code task} where changes may wait for the disk (not on a network event loop); here by default. */
    default void later(Runnable task) {
        task.run();
    }
}
