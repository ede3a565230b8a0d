/**
 * The server's password hashing (nuxt-auth-utils' scrypt, configured by runtimeConfig.hash),
 * handed in by the route: the account services are plain modules that import nothing of Nitro's.
 */
export interface PasswordHashing {
  hashPassword: (plain: string) => Promise<string>
  verifyPassword: (hash: string, plain: string) => Promise<boolean>
}
