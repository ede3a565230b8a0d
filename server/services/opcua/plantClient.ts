import { join } from 'node:path'
import { MessageSecurityMode, OPCUAClient, SecurityPolicy, UserTokenType, type UserIdentityInfo } from 'node-opcua-client'
import { OPCUACertificateManager } from 'node-opcua-certificate-manager'
import type { CollectorConfig } from './connectionRecords'
import { decryptSecret } from './connectionSecret'

// How Brinkline connects to a plant's OPC UA server, for the collector and the admin's browse
// alike: the connection's security settings, the client certificate in the PKI folder, and the
// stored user name and password.

/** Where the client keeps its application certificate and the server certificates it accepted (docs/opcua.md §O3). */
export function opcuaPkiDir(): string {
  return process.env.BRINKLINE_OPCUA_PKI_DIR || join(process.cwd(), '.data', 'opcua-pki')
}

export function createPlantClient(config: Pick<CollectorConfig, 'securityMode' | 'securityPolicy'>, pkiDir: string, applicationName: string) {
  return OPCUAClient.create({
    applicationName,
    securityMode: MessageSecurityMode[config.securityMode],
    securityPolicy: SecurityPolicy[config.securityPolicy as keyof typeof SecurityPolicy] ?? SecurityPolicy.None,
    endpointMustExist: false,
    // Reconnection is the caller's job (the collector has its own backoff), not the library's.
    connectionStrategy: { maxRetry: 0, initialDelay: 1000, maxDelay: 1000 },
    keepSessionAlive: true,
    // Trust on first use: the plant server's certificate is accepted and kept in pkiDir.
    clientCertificateManager: new OPCUACertificateManager({ rootFolder: pkiDir, automaticallyAcceptUnknownCertificate: true }),
  })
}

/** The sign-in the connection stores: anonymous without a user name. */
export function userIdentityOf(config: Pick<CollectorConfig, 'username' | 'passwordSecret'>): UserIdentityInfo | undefined {
  if (!config.username) return undefined
  const password = config.passwordSecret ? decryptSecret(config.passwordSecret) : ''
  return { type: UserTokenType.UserName, userName: config.username, password }
}
