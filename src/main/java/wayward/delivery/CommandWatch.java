package wayward.delivery;

/**
 * Operators' commands read from {@code <prefix>/command/<user>/<verb>} ({@code [mqtt] commands = true}). The user
 * level names who sent it: the broker's ACL must let each operator write only below its own name (README, "MQTT
 * commands"), since MQTT 3.1.1 tells a subscriber nothing of the publisher. Called on the publisher's event loop
 * thread: implementations hand work elsewhere or finish quickly.
 */
public interface CommandWatch {
    /** A command; {@code verb} is the last topic level ({@code mute}, {@code unmute}), {@code payload} its body. */
    void command(String user, String verb, byte[] payload);
}
