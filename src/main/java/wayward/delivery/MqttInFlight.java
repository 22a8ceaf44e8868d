package wayward.delivery;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;

/**
 * The QoS 1 publishes not yet acknowledged, by packet identifier, in the order they were made. Confined to the
 * publisher's event loop thread.
 */
final class MqttInFlight {
    private static final int MAX_PACKET_ID = 65535;

    private final LinkedHashMap<Integer, Outgoing> byId = new LinkedHashMap<>();
    private int nextPacketId = 1;

    /** One QoS 1 publish waiting for its PUBACK. */
    static final class Outgoing {
        final String topic;
        final byte[] payload;
        final boolean retain;
        final CompletableFuture<Void> acked = new CompletableFuture<>();
        boolean sent;

        Outgoing(String topic, byte[] payload, boolean retain) {
            this.topic = topic;
            this.payload = payload;
            this.retain = retain;
        }
    }

    /** Adds a publish under a free packet identifier and returns the identifier. */
    int add(Outgoing o) {
        int id = allocatePacketId();
        byId.put(id, o);
        return id;
    }

    /** A packet identifier for another packet than a publish (SUBSCRIBE), not in use by an unacknowledged one. */
    int otherId() {
        return allocatePacketId();
    }

    private int allocatePacketId() {
        // MQTT 3.1.1 §2.3.1: a non-zero 16-bit identifier not in use by another unacknowledged publish
        while (byId.containsKey(nextPacketId)) {
            nextPacketId = nextPacketId % MAX_PACKET_ID + 1;
        }
        int id = nextPacketId;
        nextPacketId = nextPacketId % MAX_PACKET_ID + 1;
        return id;
    }

    /** A PUBACK came: the publish with that identifier is done. Unknown identifiers are ignored. */
    void acknowledged(int id) {
        Outgoing o = byId.remove(id);
        if (o != null) {
            o.acked.complete(null);
        }
    }

    int size() {
        return byId.size();
    }

    /** Every unacknowledged publish, in order, as a copy. */
    List<Map.Entry<Integer, Outgoing>> all() {
        return new ArrayList<>(byId.entrySet());
    }
}
