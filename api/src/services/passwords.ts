import bcrypt from 'bcryptjs'

const COST = 10

export const hashPassword = (password: string) => bcrypt.hash(password, COST)

// A real hash of a random string: comparing against it costs what a real comparison costs,
// so an unknown e-mail takes as long to refuse as a wrong password.
const DUMMY_HASH = bcrypt.hashSync(crypto.randomUUID(), COST)

/** Compares in constant cost whether or not there is a stored hash. */
export async function checkPassword(password: string, hash: string | null | undefined): Promise<boolean> {
  const ok = await bcrypt.compare(password, hash ?? DUMMY_HASH)
  return ok && !!hash
}
