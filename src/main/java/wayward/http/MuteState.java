package wayward.http;

import java.time.Instant;

/**
 * A mute in force: a zone's (or a whole camera's) rule raises no events until it ends by itself or is ended early.
 *
 * @param camera the camera's id
 * @param zone   the zone's id, or null for the whole camera
 * @param since  when it began
 * @param until  when it ends by itself
 * @param by     who: the status server's token name or the MQTT user
 * @param reason why, in the operator's words (may be empty)
 */
public record MuteState(String camera, String zone, Instant since, Instant until, String by, String reason) {
}
