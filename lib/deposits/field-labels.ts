/**
 * Names of deposit fields that more than one place shows. Imports nothing, so any module (the
 * downloads' streams included) can take a name from here without loading the deposit vocabulary.
 */

/**
 * THE name of the deposit's free-text conditions (`conditions.notes`): the editor's label, the
 * review's change lists, the dataset page and the downloads' header all say it so.
 */
export const OTHER_CONDITIONS_LABEL = "Other conditions";
