package wayward.delivery;

import io.netty.buffer.Unpooled;
import io.netty.handler.codec.mqtt.MqttConnectMessage;
import io.netty.handler.codec.mqtt.MqttConnectReturnCode;
import io.netty.handler.codec.mqtt.MqttFixedHeader;
import io.netty.handler.codec.mqtt.MqttMessage;
import io.netty.handler.codec.mqtt.MqttMessageBuilders;
import io.netty.handler.codec.mqtt.MqttMessageIdVariableHeader;
import io.netty.handler.codec.mqtt.MqttMessageType;
import io.netty.handler.codec.mqtt.MqttPublishMessage;
import io.netty.handler.codec.mqtt.MqttPublishVariableHeader;
import io.netty.handler.codec.mqtt.MqttQoS;
import io.netty.handler.codec.mqtt.MqttSubscribeMessage;
import io.netty.handler.codec.mqtt.MqttVersion;

/**
 * The MQTT 3.1.1 packets this client sends, as messages for Netty's MQTT encoder, and what a refusing CONNACK
 * means. No session state: packet identifiers and the DUP flag come from the caller.
 */
final class MqttPackets {
    private MqttPackets() {
    }

    /** CONNECT keeping the session (clean session 0), with a retained QoS 1 will. */
    static MqttConnectMessage connect(MqttConfig config, String willTopic, byte[] will) {
        MqttMessageBuilders.ConnectBuilder c = MqttMessageBuilders.connect()
                .protocolVersion(MqttVersion.MQTT_3_1_1)
                .clientId(config.clientId())
                .cleanSession(false)
                .keepAlive(config.keepAliveSeconds())
                .willFlag(true)
                .willQoS(MqttQoS.AT_LEAST_ONCE)
                .willRetain(true)
                .willTopic(willTopic)
                .willMessage(will);
        if (config.username() != null) {
            c.hasUser(true).username(config.username());
            if (config.password() != null) {
                c.hasPassword(true).password(config.password());
            }
        }
        return c.build();
    }

    /** A QoS 1 PUBLISH; {@code dup} on a retransmission (MQTT 3.1.1 §3.3.1.1). */
    static MqttPublishMessage publish(int packetId, String topic, byte[] payload, boolean retain, boolean dup) {
        return new MqttPublishMessage(
                new MqttFixedHeader(MqttMessageType.PUBLISH, dup, MqttQoS.AT_LEAST_ONCE, retain, 0),
                new MqttPublishVariableHeader(topic, packetId), Unpooled.wrappedBuffer(payload));
    }

    /** SUBSCRIBE to one topic filter at the QoS given. */
    static MqttSubscribeMessage subscribe(int packetId, String filter, MqttQoS qos) {
        return MqttMessageBuilders.subscribe().messageId(packetId).addSubscription(qos, filter).build();
    }

    /** PUBACK of a QoS 1 publish received (MQTT 3.1.1 §3.4). */
    static MqttMessage pubAck(int packetId) {
        return new MqttMessage(new MqttFixedHeader(MqttMessageType.PUBACK, false, MqttQoS.AT_MOST_ONCE, false, 2),
                MqttMessageIdVariableHeader.from(packetId));
    }

    static MqttMessage pingReq() {
        return headerOnly(MqttMessageType.PINGREQ);
    }

    static MqttMessage disconnect() {
        return headerOnly(MqttMessageType.DISCONNECT);
    }

    private static MqttMessage headerOnly(MqttMessageType type) {
        return new MqttMessage(new MqttFixedHeader(type, false, MqttQoS.AT_MOST_ONCE, false, 0));
    }

    /** Why the broker refused the connection, for the log. */
    static String refusal(MqttConnectReturnCode code, MqttConfig config) {
        return switch (code) {
            case CONNECTION_REFUSED_BAD_USER_NAME_OR_PASSWORD ->
                    "broker refused the login of user '" + config.username()
                            + "': bad user name or password (CONNACK code 4)";
            case CONNECTION_REFUSED_NOT_AUTHORIZED ->
                    "broker refused the connection: not authorised"
                            + (config.username() == null ? " (no username configured)" : " for user '"
                            + config.username() + "'") + " (CONNACK code 5)";
            case CONNECTION_REFUSED_IDENTIFIER_REJECTED ->
                    "broker rejected the client id '" + config.clientId() + "' (CONNACK code 2)";
            default -> "broker refused the connection: " + code;
        };
    }
}
