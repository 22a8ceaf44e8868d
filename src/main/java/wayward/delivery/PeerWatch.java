package wayward.delivery;

/**
 * What the MQTT publisher tells of the other instances' retained statuses, for instances that share the cameras
 * of one config. Called on the publisher's event loop thread: implementations hand work elsewhere and return.
 */
public interface PeerWatch {
    /** Connected and subscribed to every status: the retained ones follow at once. */
    void subscribed();

    /** An instance's status: online, or offline (it stopped, or the broker fired its will). */
    void status(String instance, boolean online);

    /** The connection to the broker is gone: nothing can be known of the others until {@link #subscribed}. */
    void lost();
}
