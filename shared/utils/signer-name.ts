/** A name as compared for signing: letter case, accents' case and spacing aside. */
export const normalName = (name: string) => name.normalize('NFC').trim().replace(/\s+/g, ' ').toLocaleLowerCase('en')

/** Whether a typed name is the name on the signer's account, case and spacing aside. */
export const sameName = (typed: string, onFile: string) => normalName(typed) === normalName(onFile)
